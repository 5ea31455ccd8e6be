/** The home page's figures: recent volume per project and the live waste containers. */
import type { DayPeriod } from "../../ledger/period";
import { usageByProject } from "./usage";
import { listContainers } from "./waste/containers";

export interface ProjectVolume {
  projectCode: string;
  projectName: string;
  clientName: string;
  volume_mL: number;
  runs: number;
}

/**
 * Volume and runs per project over a period, optionally for one client organisation: the usage
 * screen's own figures (`usageByProject`), so the overview and /usage never disagree.
 */
export async function recentUsageByProject(period: DayPeriod, clientId: number | null = null): Promise<ProjectVolume[]> {
  const answer = await usageByProject({ ...period, groupBy: "project" }, { clientId });
  return answer.rows
    .map((row) => ({
      projectCode: row.projectCode,
      projectName: row.projectName,
      clientName: row.clientName,
      volume_mL: Object.values(row.volumes_mL).reduce((sum, v) => sum + v, 0),
      runs: row.runs,
    }))
    .sort((a, b) => b.volume_mL - a.volume_mL || a.projectCode.localeCompare(b.projectCode));
}

export interface ContainerFill {
  code: string;
  stream: string;
  room: string;
  where: string | null;
  capacity_mL: number;
  estimated_mL: number;
  fillPercent: number;
  /** At or above the site's fill threshold (or over capacity). */
  nearFull: boolean;
  status: string;
  accumulationStartedAt: string | null;
}

/** Live waste containers (not yet collected), fullest first; the estimates come from the waste service. */
export async function liveContainers(): Promise<ContainerFill[]> {
  return (await listContainers())
    .map((c) => ({
      code: c.code,
      stream: c.stream,
      room: c.room,
      where: c.locationNote,
      capacity_mL: c.capacity_mL,
      estimated_mL: c.estimated_mL,
      fillPercent: c.fill.percent,
      nearFull: c.fill.state !== "ok",
      status: c.status,
      accumulationStartedAt: c.accumulationStartedAt,
    }))
    .sort((a, b) => b.fillPercent - a.fillPercent);
}

/** The home page's figures: recent volume per project and the live waste containers. */
import { select } from "../query";
import { listContainers } from "./waste/containers";

const DAY = 86_400_000;

export interface ProjectVolume {
  projectCode: string;
  projectName: string;
  clientName: string;
  volume_mL: number;
  runs: number;
}

/** Volume drawn per project over the last `days` days, optionally for one client organisation. */
export async function recentUsageByProject(days: number, clientId: number | null = null, now = new Date()): Promise<ProjectVolume[]> {
  const rows = await select<{ code: string; name: string; client: string; volume: number; runs: number }>(
    `SELECT p.code, p.name, c.name AS client, COALESCE(SUM(l.volume_ml), 0) AS volume,
            COUNT(DISTINCT CASE WHEN l.kind = 'run' THEN l.source_id END) AS runs
       FROM projects p
       JOIN clients c ON c.id = p.client_id
       LEFT JOIN ledger_entries l ON l.project_id = p.id AND l.occurred_at >= :since AND l.occurred_at < :until
      WHERE (:clientId IS NULL OR p.client_id = :clientId)
      GROUP BY p.id, p.code, p.name, c.name
      ORDER BY volume DESC, p.code`,
    { replacements: { since: new Date(now.getTime() - days * DAY), until: now, clientId } },
  );
  return rows.map((r) => ({
    projectCode: r.code,
    projectName: r.name,
    clientName: r.client,
    volume_mL: r.volume,
    runs: r.runs,
  }));
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

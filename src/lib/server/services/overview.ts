/** The home page's figures: each role's first few, recent volume per project and the live waste containers. */
import type { DayPeriod } from "../../ledger/period";
import { select } from "../query";
import { localDay } from "../../format";
import { getFacilitySettings } from "./facility-settings";
import { usageByProject } from "./usage";
import { listContainers } from "./waste/containers";

const DAY = 86_400_000;

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
  /** Its accumulation time is close to the site's limit, or past it. */
  nearLimit: boolean;
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
      nearLimit: c.accumulation !== null && c.accumulation.state !== "ok",
      status: c.status,
      accumulationStartedAt: c.accumulationStartedAt,
    }))
    .sort((a, b) => b.fillPercent - a.fillPercent);
}

/** A technician's first look: bottles that expire within a day, and mobile phases running low. */
export async function benchFigures(now = new Date()) {
  const soon = new Date(now.getTime() + DAY);
  const [bottles] = await select<{ n: number }>(
    `SELECT COUNT(*) AS n FROM batch_bottles bb JOIN batches b ON b.id = bb.batch_id
      WHERE bb.status IN ('ready', 'in_use') AND b.status IN ('ready', 'in_use') AND b.expires_at <= :soon`,
    { replacements: { soon } },
  );
  // Mobile phases made in the last 60 days whose usable stock (not expiring within a day) is under a fifth of a batch.
  const low = await select<{ code: string; name: string }>(
    `SELECT r.code, r.name FROM recipes r JOIN recipe_versions v ON v.recipe_id = r.id JOIN batches b ON b.recipe_version_id = v.id
      WHERE r.status = 'approved' AND b.prepared_at >= :since
      GROUP BY r.id, r.code, r.name
     HAVING SUM(CASE WHEN b.status IN ('ready', 'in_use') AND b.expires_at > :soon THEN b.remaining_ml ELSE 0 END) < 0.2 * MAX(b.volume_ml)
      ORDER BY r.code`,
    { replacements: { soon, since: new Date(now.getTime() - 60 * DAY) } },
  );
  return { bottlesExpiring: bottles?.n ?? 0, toMake: low };
}

/** A manager's first look: this month's use and what it costs so far (not on a statement yet), and overdue invoices. */
export async function managerFigures(now = new Date()) {
  // The facility's month: ledger_daily and usage periods count its local days.
  const { timeZone } = await getFacilitySettings();
  const today = localDay(now, timeZone);
  const monthStart = `${today.slice(0, 8)}01`;
  const [volume] = await select<{ v: number | null }>("SELECT SUM(volume_ml) AS v FROM ledger_daily WHERE day >= :from AND day <= :to", {
    replacements: { from: monthStart, to: today },
  });
  const usage = await usageByProject({ from: monthStart, to: today, groupBy: "project" }, { clientId: null });
  const unbilled = new Map<string, number>();
  for (const row of usage.rows) unbilled.set(row.cost.currency, (unbilled.get(row.cost.currency) ?? 0) + row.cost.amount);
  const overdue = await select<{ n: number; amount: number; currency: string }>(
    "SELECT COUNT(*) AS n, SUM(amount_minor) AS amount, currency FROM invoices WHERE status = 'open' AND due_on < :today GROUP BY currency",
    { replacements: { today } },
  );
  return {
    monthStart,
    usage_mL: volume?.v ?? 0,
    unbilled: [...unbilled].map(([currency, amount]) => ({ amount, currency })),
    overdue: overdue.map((o) => ({ count: o.n, amount: o.amount, currency: o.currency })),
  };
}

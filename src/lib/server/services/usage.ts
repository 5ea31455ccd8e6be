/**
 * Usage per project and period: volumes summed by the database over indexed columns, costed at
 * the rate in force on the day of each entry for the client's price list (src/lib/billing/rates).
 */
import { QueryTypes } from "sequelize";
import { costLines, type CostLine, type PriceList, type Rate } from "../../billing/rates";
import type { UsageQuery } from "../../schemas/usage";
import { getSequelize } from "../db";

export interface UsageRow {
  projectCode: string;
  projectName: string;
  clientName: string;
  /** mL per reagent id over the period (corrections included, so a reversed entry counts 0). */
  volumes_mL: Record<string, number>;
  /** g per solid reagent id. */
  masses_g: Record<string, number>;
  runs: number;
  injections: number;
  cost: { amount: number; currency: string };
  /** Reagents used but without a rate in force: not in the cost. */
  uncosted: string[];
}

export interface UsageAnswer {
  from: string;
  to: string;
  groupBy: "project";
  rows: UsageRow[];
}

const round = (v: number, digits: number) => Math.round(v * 10 ** digits) / 10 ** digits;

/** Half-open UTC bounds of a period whose `from` and `to` days are both included. */
export function periodBounds(from: string, to: string): [Date, Date] {
  const start = new Date(`${from}T00:00:00.000Z`);
  const end = new Date(`${to}T00:00:00.000Z`);
  end.setUTCDate(end.getUTCDate() + 1);
  return [start, end];
}

/** All rates (a small table), in the pure module's shape. */
export async function loadRates(): Promise<Rate[]> {
  const rows = await getSequelize().query<{ id: number; kind: Rate["kind"]; reagent_id: string | null; grade: string | null; price_list: PriceList; unit: Rate["unit"]; amount_minor: number; currency: string; effective_from: string | Date }>(
    "SELECT id, kind, reagent_id, grade, price_list, unit, amount_minor, currency, effective_from FROM rates",
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    id: r.id, kind: r.kind, reagentId: r.reagent_id, grade: r.grade, priceList: r.price_list, unit: r.unit, amount_minor: r.amount_minor, currency: r.currency,
    effectiveFrom: typeof r.effective_from === "string" ? r.effective_from.slice(0, 10) : r.effective_from.toISOString().slice(0, 10),
  }));
}

/**
 * `GET /api/usage`. `clientId` limits the answer to one client organisation's projects (a
 * client contact's own); null means every project.
 */
export async function usageByProject(query: UsageQuery, scope: { clientId: number | null }): Promise<UsageAnswer> {
  const sequelize = getSequelize();
  const [start, end] = periodBounds(query.from, query.to);
  const replacements = { start, end, clientId: scope.clientId };
  const scoped = "(:clientId IS NULL OR l.project_id IN (SELECT sp.id FROM projects sp WHERE sp.client_id = :clientId))";

  const [totals, daily, runs, projects, rates] = await Promise.all([
    sequelize.query<{ project_id: number; reagent_id: string; volume: string; mass: string | null }>(
      `SELECT l.project_id, l.reagent_id, SUM(l.volume_ml) AS volume, SUM(l.mass_g) AS mass
         FROM ledger_entries l
        WHERE l.occurred_at >= :start AND l.occurred_at < :end AND l.project_id IS NOT NULL AND ${scoped}
        GROUP BY l.project_id, l.reagent_id`,
      { type: QueryTypes.SELECT, replacements },
    ),
    // Rates change by the day, so per-day sums cost exactly what per-entry costing would.
    sequelize.query<{ project_id: number; reagent_id: string; day: string | Date; volume: string; mass: string | null }>(
      `SELECT l.project_id, l.reagent_id, DATE(l.occurred_at) AS day, SUM(l.volume_ml) AS volume, SUM(l.mass_g) AS mass
         FROM ledger_entries l
        WHERE l.occurred_at >= :start AND l.occurred_at < :end AND l.project_id IS NOT NULL AND ${scoped}
        GROUP BY l.project_id, l.reagent_id, DATE(l.occurred_at)`,
      { type: QueryTypes.SELECT, replacements },
    ),
    sequelize.query<{ project_id: number; runs: number; injections: string }>(
      `SELECT r.project_id, COUNT(*) AS runs, SUM(r.injections) AS injections
         FROM runs r
        WHERE r.started_at >= :start AND r.started_at < :end
          AND (:clientId IS NULL OR r.project_id IN (SELECT sp.id FROM projects sp WHERE sp.client_id = :clientId))
        GROUP BY r.project_id`,
      { type: QueryTypes.SELECT, replacements },
    ),
    sequelize.query<{ id: number; code: string; name: string; client_name: string; kind: "internal" | "external"; currency: string }>(
      `SELECT p.id, p.code, p.name, c.name AS client_name, c.kind, c.currency
         FROM projects p JOIN clients c ON c.id = p.client_id WHERE (:clientId IS NULL OR p.client_id = :clientId)`,
      { type: QueryTypes.SELECT, replacements },
    ),
    loadRates(),
  ]);

  const rows = new Map<number, UsageRow>();
  const projectById = new Map(projects.map((p) => [p.id, p]));
  const rowFor = (projectId: number) => {
    let row = rows.get(projectId);
    const project = projectById.get(projectId);
    if (!row && project) {
      row = { projectCode: project.code, projectName: project.name, clientName: project.client_name, volumes_mL: {}, masses_g: {}, runs: 0, injections: 0, cost: { amount: 0, currency: project.currency }, uncosted: [] };
      rows.set(projectId, row);
    }
    return row;
  };
  for (const t of totals) {
    const row = rowFor(t.project_id);
    if (!row) continue;
    row.volumes_mL[t.reagent_id] = round(Number(t.volume), 4);
    if (t.mass !== null) row.masses_g[t.reagent_id] = round(Number(t.mass), 5);
  }
  for (const r of runs) {
    const row = rowFor(r.project_id);
    if (!row) continue;
    row.runs = Number(r.runs);
    row.injections = Number(r.injections);
  }
  const linesByProject = new Map<number, CostLine[]>();
  for (const d of daily) {
    const lines = linesByProject.get(d.project_id) ?? [];
    lines.push({ reagentId: d.reagent_id, volume_mL: d.volume, mass_g: d.mass, at: typeof d.day === "string" ? d.day.slice(0, 10) : d.day.toISOString().slice(0, 10) });
    linesByProject.set(d.project_id, lines);
  }
  for (const [projectId, lines] of linesByProject) {
    const row = rowFor(projectId);
    const project = projectById.get(projectId);
    if (!row || !project) continue;
    const cost = costLines(lines, rates, { priceList: project.kind, currency: project.currency });
    row.cost = { amount: cost.amount_minor, currency: cost.currency };
    row.uncosted = cost.uncosted;
  }
  return { from: query.from, to: query.to, groupBy: "project", rows: [...rows.values()].sort((a, b) => a.projectCode.localeCompare(b.projectCode)) };
}

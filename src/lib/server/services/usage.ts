/**
 * Usage per project and period: volumes summed by the database from the per-day ledger sums,
 * costed at the rate in force on the day of each entry for the client's price list
 * (src/lib/billing/rates).
 */
import { costLines, toMicro, type CostLine, type PriceList, type Rate } from "../../billing/rates";
import type { UsageAnswer, UsageRow } from "../../ledger/types";
import type { UsageQuery } from "../../schemas/usage";
import { periodBounds } from "../../ledger/period";
import { select } from "../query";
import { getFacilitySettings } from "./facility-settings";

const round = (v: number, digits: number) => Math.round(v * 10 ** digits) / 10 ** digits;

/** All rates (a small table), in the pure module's shape. */
export async function loadRates(): Promise<Rate[]> {
  const rows = await select<{
    id: number;
    kind: Rate["kind"];
    reagent_id: string | null;
    grade: string | null;
    price_list: PriceList;
    unit: Rate["unit"];
    amount_minor: number;
    currency: string;
    effective_from: string | Date;
  }>("SELECT id, kind, reagent_id, grade, price_list, unit, amount_minor, currency, effective_from FROM rates");
  return rows.map((r) => ({
    id: r.id,
    kind: r.kind,
    reagentId: r.reagent_id,
    grade: r.grade,
    priceList: r.price_list,
    unit: r.unit,
    amount_minor: r.amount_minor,
    currency: r.currency,
    effectiveFrom: typeof r.effective_from === "string" ? r.effective_from.slice(0, 10) : r.effective_from.toISOString().slice(0, 10),
  }));
}

/**
 * The rate segments of a period: days on which any rate starts split it, so that every reagent
 * has one rate in force throughout each segment. SQL for the GROUP BY (", <segment number of
 * d.day>", empty when no rate starts inside the period), and its bounds as replacements.
 */
export function rateSegments(rates: readonly Rate[], from: string, to: string): { sql: string; replacements: Record<string, string> } {
  const cuts = [...new Set(rates.map((r) => r.effectiveFrom))].filter((d) => d > from && d <= to).sort();
  if (cuts.length === 0) return { sql: "", replacements: {} };
  const replacements: Record<string, string> = {};
  const whens = cuts.map((cut, i) => {
    replacements[`cut${i}`] = cut;
    return `WHEN d.day < :cut${i} THEN ${i}`;
  });
  return { sql: `, CASE ${whens.join(" ")} ELSE ${cuts.length} END`, replacements };
}

/** The usage endpoint's one aggregate (exported for the benchmark's EXPLAIN). */
export const usageSumsSql = (segmentSql: string) =>
  `SELECT d.project_id, d.reagent_id, MIN(d.day) AS at, SUM(d.volume_ml) AS volume, SUM(d.mass_g) AS mass
     FROM ledger_daily d
    WHERE d.day >= :from AND d.day <= :to
      AND (:clientId IS NULL OR d.project_id IN (SELECT sp.id FROM projects sp WHERE sp.client_id = :clientId))
    GROUP BY d.project_id, d.reagent_id${segmentSql}`;

/**
 * `GET /api/usage`. `clientId` limits the answer to one client organisation's projects (a
 * client contact's own); null means every project.
 *
 * Reads the per-day sums in `ledger_daily` (kept by a trigger on every ledger insert), summed
 * once more per rate segment: within a segment every rate is constant and costing is linear, so
 * the cost is exactly what costing each entry on its own day would give, from a few hundred rows.
 */
export async function usageByProject(query: UsageQuery, scope: { clientId: number | null }): Promise<UsageAnswer> {
  // ledger_daily holds the facility's local days; the runs are counted over the same local days.
  const { timeZone } = await getFacilitySettings();
  const [start, end] = periodBounds(query.from, query.to, timeZone);
  const replacements = { start, end, clientId: scope.clientId };
  // The rates decide the segments, so they come first; the other reads run alongside.
  const ratesAndSums = loadRates().then(async (rates) => {
    const segments = rateSegments(rates, query.from, query.to);
    const sums = await select<{ project_id: number; reagent_id: string; at: string | Date; volume: number; mass: number | null }>(
      usageSumsSql(segments.sql),
      { replacements: { ...segments.replacements, from: query.from, to: query.to, clientId: scope.clientId } },
    );
    return { rates, sums };
  });

  const [{ rates, sums }, runs, projects] = await Promise.all([
    ratesAndSums,
    select<{ project_id: number; runs: number; injections: number }>(
      `SELECT r.project_id, COUNT(*) AS runs, SUM(r.injections) AS injections
         FROM runs r
        WHERE r.started_at >= :start AND r.started_at < :end
          AND (:clientId IS NULL OR r.project_id IN (SELECT sp.id FROM projects sp WHERE sp.client_id = :clientId))
        GROUP BY r.project_id`,
      { replacements },
    ),
    select<{ id: number; code: string; name: string; client_name: string; kind: "internal" | "external"; currency: string }>(
      `SELECT p.id, p.code, p.name, c.name AS client_name, c.kind, c.currency
         FROM projects p JOIN clients c ON c.id = p.client_id WHERE (:clientId IS NULL OR p.client_id = :clientId)`,
      { replacements },
    ),
  ]);

  const rows = new Map<number, UsageRow>();
  const projectById = new Map(projects.map((p) => [p.id, p]));
  const rowFor = (projectId: number) => {
    let row = rows.get(projectId);
    const project = projectById.get(projectId);
    if (!row && project) {
      row = {
        projectCode: project.code,
        projectName: project.name,
        clientName: project.client_name,
        volumes_mL: {},
        masses_g: {},
        runs: 0,
        injections: 0,
        cost: { amount: 0, currency: project.currency },
        uncosted: [],
      };
      rows.set(projectId, row);
    }
    return row;
  };
  // Totals per project and reagent: the segments' sums added exactly (in 10⁻⁶ units).
  const totals = new Map<string, { projectId: number; reagentId: string; volume: bigint; mass: bigint | null }>();
  const linesByProject = new Map<number, CostLine[]>();
  for (const d of sums) {
    const key = `${d.project_id}|${d.reagent_id}`;
    const total = totals.get(key) ?? { projectId: d.project_id, reagentId: d.reagent_id, volume: 0n, mass: null };
    total.volume += toMicro(d.volume);
    if (d.mass !== null) total.mass = (total.mass ?? 0n) + toMicro(d.mass);
    totals.set(key, total);
    const lines = linesByProject.get(d.project_id) ?? [];
    lines.push({
      reagentId: d.reagent_id,
      volume_mL: d.volume,
      mass_g: d.mass,
      at: typeof d.at === "string" ? d.at.slice(0, 10) : d.at.toISOString().slice(0, 10),
    });
    linesByProject.set(d.project_id, lines);
  }
  for (const t of totals.values()) {
    const row = rowFor(t.projectId);
    if (!row) continue;
    row.volumes_mL[t.reagentId] = round(Number(t.volume) / 1e6, 4);
    if (t.mass !== null) row.masses_g[t.reagentId] = round(Number(t.mass) / 1e6, 5);
  }
  for (const r of runs) {
    const row = rowFor(r.project_id);
    if (!row) continue;
    row.runs = r.runs;
    row.injections = r.injections;
  }
  for (const [projectId, lines] of linesByProject) {
    const row = rowFor(projectId);
    const project = projectById.get(projectId);
    if (!row || !project) continue;
    const cost = costLines(lines, rates, { priceList: project.kind, currency: project.currency });
    row.cost = { amount: cost.amount_minor, currency: cost.currency };
    row.uncosted = cost.uncosted;
  }
  return {
    from: query.from,
    to: query.to,
    groupBy: "project",
    rows: [...rows.values()].sort((a, b) => a.projectCode.localeCompare(b.projectCode)),
  };
}

/** Reagent id → name, so screens show "Formic acid" where the ledger keeps `formic-acid`. */
export async function reagentNames(): Promise<Record<string, string>> {
  return Object.fromEntries((await select<{ id: string; name: string }>("SELECT id, name FROM reagents")).map((r) => [r.id, r.name]));
}

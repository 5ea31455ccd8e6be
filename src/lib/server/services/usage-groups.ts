/**
 * Usage grouped by client, instrument, reagent or month, with the volume of each mobile phase
 * (the recipe of the batch an entry came from) beside the volume of each reagent. The project
 * grouping (the fixed contract) stays in usage.ts; this module only adds to it.
 *
 * One aggregate over `ledger_entries` for the period (its occurred_at index), joined by primary
 * key to the batch → recipe version → recipe, and for the instrument to the run named by
 * `source_id = 'run:<id>'`. The sums are grouped per project and rate segment too, so each
 * project is costed at its own client's price list exactly as usage.ts does it.
 */
import { costLines, toMicro, type CostLine, type PriceList, type Rate } from "../../billing/rates";
import type { GroupedBy, GroupedUsageAnswer, GroupedUsageRow } from "../../ledger/types";
import type { UsageQuery } from "../../schemas/usage";
import { startOfLocalDay } from "../../format";
import { periodBounds } from "../../ledger/period";
import { select } from "../query";
import { getFacilitySettings } from "./facility-settings";
import { loadRates } from "./usage";

export const NONE = "none";

/** A stored UTC instant as the facility's wall clock: the offset in force then (facility_utc_offsets, one PK read). */
const localTime = (column: string) =>
  `(${column} + INTERVAL COALESCE((SELECT o.offset_minutes FROM facility_utc_offsets o WHERE o.starts_at <= ${column} ORDER BY o.starts_at DESC LIMIT 1), 0) MINUTE)`;

const GROUP_KEY: Record<GroupedBy | "project", { key: string; label: string }> = {
  project: { key: "l.project_id", label: "p.code" },
  client: { key: "p.client_id", label: "c.name" },
  instrument: { key: "r.instrument_id", label: "i.name" },
  reagent: { key: "l.reagent_id", label: "rg.name" },
  month: { key: `DATE_FORMAT(${localTime("l.occurred_at")}, '%Y-%m')`, label: `DATE_FORMAT(${localTime("l.occurred_at")}, '%Y-%m')` },
};

const round = (v: number, digits: number) => Math.round(v * 10 ** digits) / 10 ** digits;
const dayOf = (v: string | Date) => (typeof v === "string" ? v.slice(0, 10) : v.toISOString().slice(0, 10));

/** Days on which a rate starts (local midnight) split the period, so each (group, project, reagent, segment) sum has one rate in force. */
function segmentSql(
  rates: readonly Rate[],
  from: string,
  to: string,
  timeZone: string,
): { sql: string; replacements: Record<string, Date> } {
  const cuts = [...new Set(rates.map((r) => r.effectiveFrom))].filter((d) => d > from && d <= to).sort();
  const replacements: Record<string, Date> = {};
  if (cuts.length === 0) return { sql: "", replacements };
  const whens = cuts.map((cut, i) => {
    replacements[`segCut${i}`] = startOfLocalDay(cut, timeZone);
    return `WHEN l.occurred_at < :segCut${i} THEN ${i}`;
  });
  return { sql: `, CASE ${whens.join(" ")} ELSE ${cuts.length} END`, replacements };
}

/** The one aggregate (exported for tests and EXPLAIN). */
export const groupedSumsSql = (groupBy: GroupedBy | "project", segment: string) => {
  const g = GROUP_KEY[groupBy];
  return `SELECT ${g.key} AS group_key, MAX(${g.label}) AS group_label, l.project_id, l.reagent_id, rc.code AS recipe_code, MAX(rc.name) AS recipe_name,
          MIN(DATE(${localTime("l.occurred_at")})) AS at, SUM(l.volume_ml) AS volume, SUM(l.mass_g) AS mass
     FROM ledger_entries l
     JOIN projects p ON p.id = l.project_id
     JOIN clients c ON c.id = p.client_id
     JOIN reagents rg ON rg.id = l.reagent_id
     LEFT JOIN batches b ON b.id = l.batch_id
     LEFT JOIN recipe_versions rv ON rv.id = b.recipe_version_id
     LEFT JOIN recipes rc ON rc.id = rv.recipe_id
     LEFT JOIN runs r ON l.source_id LIKE 'run:%' AND r.id = CAST(SUBSTRING(l.source_id, 5) AS UNSIGNED)
     LEFT JOIN instruments i ON i.id = r.instrument_id
    WHERE l.occurred_at >= :start AND l.occurred_at < :end
      AND (:clientId IS NULL OR p.client_id = :clientId)
    GROUP BY group_key, l.project_id, l.reagent_id, rc.code${segment}`;
};

interface SumRow {
  group_key: string | number | null;
  group_label: string | null;
  project_id: number;
  reagent_id: string;
  recipe_code: string | null;
  recipe_name: string | null;
  at: string | Date;
  volume: number;
  mass: number | null;
}

async function sums(
  groupBy: GroupedBy | "project",
  query: UsageQuery,
  clientId: number | null,
  rates: readonly Rate[],
  timeZone: string,
): Promise<SumRow[]> {
  const [start, end] = periodBounds(query.from, query.to, timeZone);
  const segment = segmentSql(rates, query.from, query.to, timeZone);
  return select<SumRow>(groupedSumsSql(groupBy, segment.sql), { replacements: { ...segment.replacements, start, end, clientId } });
}

/** Adds exactly (in 10⁻⁶ units) into a map of totals. */
function add(totals: Map<string, bigint>, key: string, value: number | null) {
  if (value === null) return;
  totals.set(key, (totals.get(key) ?? 0n) + toMicro(value));
}
const toRecord = (totals: Map<string, bigint>, digits: number) =>
  Object.fromEntries([...totals].map(([k, v]) => [k, round(Number(v) / 1e6, digits)]));

/** `GET /api/usage?groupBy=client|instrument|reagent|month`; `clientId` limits it to one organisation's projects. */
export async function usageGrouped(
  query: UsageQuery & { groupBy: GroupedBy },
  scope: { clientId: number | null },
): Promise<GroupedUsageAnswer> {
  const groupBy = query.groupBy;
  const { timeZone } = await getFacilitySettings();
  const [start, end] = periodBounds(query.from, query.to, timeZone);
  const runKey: Record<GroupedBy, string | null> = {
    client: "p.client_id",
    instrument: "r.instrument_id",
    month: `DATE_FORMAT(${localTime("r.started_at")}, '%Y-%m')`,
    reagent: null,
  };
  const runSql = runKey[groupBy];
  const rates = await loadRates();
  const [rows, projects, runs] = await Promise.all([
    sums(groupBy, query, scope.clientId, rates, timeZone),
    select<{ id: number; kind: PriceList; currency: string }>(
      "SELECT p.id, c.kind, c.currency FROM projects p JOIN clients c ON c.id = p.client_id WHERE (:clientId IS NULL OR p.client_id = :clientId)",
      { replacements: { clientId: scope.clientId } },
    ),
    runSql === null
      ? Promise.resolve([])
      : select<{ group_key: string | number; runs: number; injections: number }>(
          `SELECT ${runSql} AS group_key, COUNT(*) AS runs, SUM(r.injections) AS injections
             FROM runs r JOIN projects p ON p.id = r.project_id
            WHERE r.started_at >= :start AND r.started_at < :end AND (:clientId IS NULL OR p.client_id = :clientId)
            GROUP BY group_key`,
          { replacements: { start, end, clientId: scope.clientId } },
        ),
  ]);
  const projectById = new Map(projects.map((p) => [p.id, p]));
  const mobilePhases: Record<string, string> = {};
  const groups = new Map<
    string,
    {
      label: string;
      volumes: Map<string, bigint>;
      masses: Map<string, bigint>;
      phases: Map<string, bigint>;
      lines: Map<number, CostLine[]>;
    }
  >();
  for (const s of rows) {
    const key = s.group_key === null ? NONE : String(s.group_key);
    let g = groups.get(key);
    if (!g) {
      const label =
        s.group_key === null
          ? groupBy === "instrument"
            ? "Not on an instrument (draws, preparation, discards)"
            : "—"
          : (s.group_label ?? key);
      g = { label, volumes: new Map(), masses: new Map(), phases: new Map(), lines: new Map() };
      groups.set(key, g);
    }
    add(g.volumes, s.reagent_id, s.volume);
    add(g.masses, s.reagent_id, s.mass);
    const phase = s.recipe_code ?? NONE;
    add(g.phases, phase, s.volume);
    mobilePhases[phase] = s.recipe_name ?? "Not from a batch";
    const lines = g.lines.get(s.project_id) ?? [];
    lines.push({ reagentId: s.reagent_id, volume_mL: s.volume, mass_g: s.mass, at: dayOf(s.at) });
    g.lines.set(s.project_id, lines);
  }
  const runsByKey = new Map(runs.map((r) => [String(r.group_key ?? NONE), r]));
  const answerRows: GroupedUsageRow[] = [...groups].map(([key, g]) => {
    const byCurrency = new Map<string, number>();
    const uncosted = new Set<string>();
    for (const [projectId, lines] of g.lines) {
      const project = projectById.get(projectId);
      if (!project) continue;
      const cost = costLines(lines, rates, { priceList: project.kind, currency: project.currency });
      byCurrency.set(cost.currency, (byCurrency.get(cost.currency) ?? 0) + cost.amount_minor);
      for (const u of cost.uncosted) uncosted.add(u);
    }
    const costs = [...byCurrency].map(([currency, amount]) => ({ amount, currency })).sort((a, b) => a.currency.localeCompare(b.currency));
    const run = runsByKey.get(key);
    return {
      key,
      label: g.label,
      volumes_mL: toRecord(g.volumes, 4),
      masses_g: toRecord(g.masses, 5),
      mobilePhases_mL: toRecord(g.phases, 4),
      runs: runSql === null ? null : (run?.runs ?? 0),
      injections: runSql === null ? null : (run?.injections ?? 0),
      cost: costs.length === 1 ? costs[0]! : null,
      costs,
      uncosted: [...uncosted].sort(),
    };
  });
  answerRows.sort((a, b) => (groupBy === "month" ? a.key.localeCompare(b.key) : a.label.localeCompare(b.label)));
  return { from: query.from, to: query.to, groupBy, rows: answerRows, mobilePhases };
}

/** Each project's mobile-phase volumes for the period (project code → recipe code → mL), for the project grouping. */
export async function mobilePhasesByProject(
  query: UsageQuery,
  scope: { clientId: number | null },
): Promise<{ byProject: Map<string, Record<string, number>>; mobilePhases: Record<string, string> }> {
  const { timeZone } = await getFacilitySettings();
  const rows = await sums("project", query, scope.clientId, [], timeZone);
  const totals = new Map<string, Map<string, bigint>>();
  const mobilePhases: Record<string, string> = {};
  for (const s of rows) {
    const code = s.group_label ?? String(s.group_key);
    const phase = s.recipe_code ?? NONE;
    const t = totals.get(code) ?? new Map<string, bigint>();
    add(t, phase, s.volume);
    totals.set(code, t);
    mobilePhases[phase] = s.recipe_name ?? "Not from a batch";
  }
  return { byProject: new Map([...totals].map(([code, t]) => [code, toRecord(t, 4)])), mobilePhases };
}

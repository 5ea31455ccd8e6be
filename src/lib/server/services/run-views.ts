/**
 * What the run screens read: the run list (`/runs`, `GET /api/runs`), one run (`/runs/:id`), and
 * the batches and projects the run and draw forms offer.
 */
import { round4 } from "../../ledger/plan-run";
import type { ProjectChoice, RunSummary, UsableBatch } from "../../ledger/types";
import type { ListPage } from "../../lists/types";
import type { RunListFilter, RunListQuery } from "../../schemas/runs";
import { csvResponse, likePrefix, listPage, periodConditions, type Condition, type CsvColumn, type ListSpec } from "../list-page";
import { jsonColumn, select } from "../query";

interface RunRow {
  id: number;
  reference: string | null;
  instrument: string;
  method: string;
  project_code: string;
  operator: string | null;
  started_at: Date;
  injections: number;
  blanks: number;
  purge_ml: number;
  channel_batches: unknown;
  channel_volumes: unknown;
  import_id: number | null;
  ledger_ml: number | null;
}

async function summarise(rows: RunRow[]): Promise<RunSummary[]> {
  const parsed = rows.map((r) => ({
    row: r,
    batches: jsonColumn<Record<string, number>>(r.channel_batches),
    volumes: jsonColumn<Record<string, number>>(r.channel_volumes),
  }));
  const batchIds = [...new Set(parsed.flatMap((p) => Object.values(p.batches)))];
  const codes = new Map<number, { code: string; recipe: string }>();
  if (batchIds.length) {
    for (const b of await select<{ id: number; code: string; recipe: string }>(
      `SELECT b.id, b.code, CONCAT(rc.code, ' · ', rc.name) AS recipe FROM batches b
         JOIN recipe_versions v ON v.id = b.recipe_version_id JOIN recipes rc ON rc.id = v.recipe_id WHERE b.id IN (:ids)`,
      { replacements: { ids: batchIds } },
    ))
      codes.set(b.id, { code: b.code, recipe: b.recipe });
  }
  return parsed.map(({ row: r, batches, volumes }) => ({
    id: r.id,
    reference: r.reference,
    instrument: r.instrument,
    method: r.method,
    projectCode: r.project_code,
    operator: r.operator,
    startedAt: new Date(r.started_at).toISOString(),
    injections: r.injections,
    blanks: r.blanks,
    purge_mL: r.purge_ml,
    channelBatches: Object.fromEntries(
      Object.entries(batches).map(([ch, id]) => [ch, { id, code: codes.get(id)?.code ?? null, recipeName: codes.get(id)?.recipe ?? null }]),
    ),
    channelVolumes_mL: volumes,
    total_mL: round4(Object.values(volumes).reduce((a, b) => a + b, 0)),
    ledger_mL: round4(r.ledger_ml ?? 0),
    importId: r.import_id,
  }));
}

const RUN_COLUMNS = `r.id, r.reference, i.name AS instrument, m.name AS method, p.code AS project_code, u.name AS operator, r.started_at,
         r.injections, r.blanks, r.purge_ml, r.channel_batches, r.channel_volumes, r.import_id,
         (SELECT SUM(l.volume_ml) FROM ledger_entries l WHERE l.source_id = CONCAT('run:', r.id)) AS ledger_ml`;
const RUN_FROM = `runs r
    JOIN instruments i ON i.id = r.instrument_id
    JOIN methods m ON m.id = r.method_id
    JOIN projects p ON p.id = r.project_id
    LEFT JOIN users u ON u.id = r.operator_id`;
const RUN_SELECT = `SELECT ${RUN_COLUMNS} FROM ${RUN_FROM}`;

/** The run list: newest first on runs(started_at, id); a search finds a run reference or a project code by its start. */
export const RUN_LIST: ListSpec = {
  columns: RUN_COLUMNS,
  from: RUN_FROM,
  id: "r.id",
  sorts: {
    started: "r.started_at",
    reference: "COALESCE(r.reference, '')",
    instrument: "i.name",
    project: "p.code",
    injections: "r.injections",
  },
  defaultSort: "started",
  defaultDir: "desc",
  // The projects are looked up first, so that both halves can use an index (runs_reference, runs_project_started);
  // a subquery in the OR made MariaDB walk every run by its start instead (about 90 ms at 100,000 runs).
  search: async (q) => {
    const projects = await select<{ id: number }>("SELECT id FROM projects WHERE code LIKE ?", { replacements: [likePrefix(q)] });
    return projects.length
      ? {
          sql: "r.reference LIKE :runSearch OR r.project_id IN (:runSearchProjects)",
          replacements: { runSearch: likePrefix(q), runSearchProjects: projects.map((p) => p.id) },
        }
      : { sql: "r.reference LIKE :runSearch", replacements: { runSearch: likePrefix(q) } };
  },
};

export function runFilters(filter: RunListFilter): Condition[] {
  return [
    ...(filter.instrument ? [{ sql: "r.instrument_id = :runInstrument", replacements: { runInstrument: filter.instrument } }] : []),
    ...(filter.project ? [{ sql: "r.project_id = :runProject", replacements: { runProject: filter.project } }] : []),
    ...periodConditions("r.started_at", "runStarted", filter.from, filter.to),
  ];
}

/** One page of runs, newest first unless sorted otherwise. */
export async function listRuns(query: RunListQuery): Promise<ListPage<RunSummary>> {
  const page = await listPage<RunRow>(RUN_LIST, query, runFilters(query));
  return { items: await summarise(page.items), nextCursor: page.nextCursor };
}

const RUN_CSV: CsvColumn<RunSummary>[] = [
  { header: "started_at", value: (r) => r.startedAt },
  { header: "reference", value: (r) => r.reference },
  { header: "instrument", value: (r) => r.instrument },
  { header: "method", value: (r) => r.method },
  { header: "project", value: (r) => r.projectCode },
  { header: "operator", value: (r) => r.operator },
  { header: "injections", value: (r) => r.injections },
  { header: "blanks", value: (r) => r.blanks },
  { header: "pumped_ml", value: (r) => r.total_mL },
  { header: "ledger_ml", value: (r) => r.ledger_mL },
  { header: "id", value: (r) => r.id },
];

/** Every run the query selects, as CSV. */
export function exportRuns(query: RunListQuery): Response {
  return csvResponse<RunRow, RunSummary>(RUN_LIST, query, runFilters(query), summarise, RUN_CSV, "runs.csv");
}

export async function getRun(id: number): Promise<RunSummary | null> {
  const rows = await select<RunRow>(`${RUN_SELECT} WHERE r.id = ?`, { replacements: [id] });
  return (await summarise(rows))[0] ?? null;
}

/** Batches a run or draw may use now: not used up, not discarded, not expired. */
export async function usableBatches(now = new Date()): Promise<UsableBatch[]> {
  const rows = await select<{
    id: number;
    code: string;
    recipe_name: string;
    channel: string | null;
    remaining_ml: number;
    expires_at: Date;
  }>(
    `SELECT b.id, b.code, r.name AS recipe_name, r.channel, b.remaining_ml, b.expires_at
       FROM batches b JOIN recipe_versions v ON v.id = b.recipe_version_id JOIN recipes r ON r.id = v.recipe_id
      WHERE b.status IN ('ready', 'in_use') AND b.expires_at > ? AND b.remaining_ml > 0
      ORDER BY b.code`,
    { replacements: [now] },
  );
  return rows.map((r) => ({
    id: r.id,
    code: r.code,
    name: r.recipe_name,
    channel: r.channel,
    remaining_mL: r.remaining_ml,
    expiresAt: new Date(r.expires_at).toISOString(),
  }));
}

/** Projects that can be charged, for the forms. */
export async function openProjects(clientId: number | null = null): Promise<ProjectChoice[]> {
  return select<ProjectChoice>(
    "SELECT id, code, name FROM projects WHERE status <> 'closed' AND (:clientId IS NULL OR client_id = :clientId) ORDER BY code",
    { replacements: { clientId } },
  );
}

/** What the run list's filters offer: every instrument and every project, closed ones too (old runs stay findable). */
export async function runFilterChoices(): Promise<{ instruments: { id: number; name: string }[]; projects: ProjectChoice[] }> {
  const [instruments, projects] = await Promise.all([
    select<{ id: number; name: string }>("SELECT id, name FROM instruments ORDER BY name"),
    select<ProjectChoice>("SELECT id, code, name FROM projects ORDER BY code"),
  ]);
  return { instruments, projects };
}

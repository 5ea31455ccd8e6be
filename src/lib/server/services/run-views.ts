/**
 * What the run screens read: the run list (`/runs`, `GET /api/runs`), one run (`/runs/:id`), and
 * the batches and projects the run and draw forms offer.
 */
import { round4 } from "../../ledger/plan-run";
import type { ProjectChoice, RunSummary, UsableBatch } from "../../ledger/types";
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

const RUN_SELECT = `
  SELECT r.id, r.reference, i.name AS instrument, m.name AS method, p.code AS project_code, u.name AS operator, r.started_at,
         r.injections, r.blanks, r.purge_ml, r.channel_batches, r.channel_volumes, r.import_id,
         (SELECT SUM(l.volume_ml) FROM ledger_entries l WHERE l.source_id = CONCAT('run:', r.id)) AS ledger_ml
    FROM runs r
    JOIN instruments i ON i.id = r.instrument_id
    JOIN methods m ON m.id = r.method_id
    JOIN projects p ON p.id = r.project_id
    LEFT JOIN users u ON u.id = r.operator_id`;

export async function getRun(id: number): Promise<RunSummary | null> {
  const rows = await select<RunRow>(`${RUN_SELECT} WHERE r.id = ?`, { replacements: [id] });
  return (await summarise(rows))[0] ?? null;
}

export async function listRuns(limit = 50): Promise<RunSummary[]> {
  const rows = await select<RunRow>(`${RUN_SELECT} ORDER BY r.started_at DESC, r.id DESC LIMIT ?`, { replacements: [limit] });
  return summarise(rows);
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

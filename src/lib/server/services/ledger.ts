/**
 * The solvent ledger: append-only. Entries are only ever inserted (the database refuses UPDATE and
 * DELETE on ledger_entries); a mistake is put right by a reversing entry — kind "correction", the
 * negated volume and mass, the same time, project, reagent, batch and container, a reason and its
 * author, linked to the original through `reverses_id` (unique, so nothing is reversed twice).
 */
import type { Transaction } from "sequelize";
import { getReagent } from "../../chem";
import { wasteStreamOf } from "../../ledger/split";
import type { LedgerKind, LedgerLine, LedgerSource, NewLedgerEntry } from "../../ledger/types";
import { DEFAULT_STREAM_BY_ID } from "../../waste/streams";
import { recordAudit } from "../audit";
import { getSequelize } from "../db";
import type { SignedInUser } from "../guard";
import { HttpError } from "../http";
import { execute, select } from "../query";
import { openDateForProject } from "./billing/period-locks";
import { inTransaction, multiRowInsert, pipelinedWrites } from "./sql";

const COLUMNS = [
  "occurred_at",
  "project_id",
  "kind",
  "batch_id",
  "reagent_id",
  "volume_ml",
  "mass_g",
  "channel",
  "waste_stream_id",
  "waste_container_id",
  "source_kind",
  "source_id",
  "author_id",
  "reverses_id",
  "reason",
  "created_at",
] as const;
const ROWS_PER_INSERT = 2_000;

/**
 * Makes sure the reagents and waste streams that entries refer to have their catalogue rows (a
 * recipe may name a reagent of the chemistry library that the facility never listed).
 */
export async function ensureCatalogueRows(reagentIds: Iterable<string>, transaction: Transaction) {
  const wanted = [...new Set(reagentIds)];
  if (wanted.length === 0) return;
  const present = new Set(
    (await select<{ id: string }>("SELECT id FROM reagents WHERE id IN (:wanted)", { replacements: { wanted }, transaction })).map(
      (r) => r.id,
    ),
  );
  const streams = new Set(wanted.map(wasteStreamOf).filter((s): s is string => s !== null));
  if (streams.size > 0) {
    const known = new Set((await select<{ id: string }>("SELECT id FROM waste_streams", { transaction })).map((r) => r.id));
    for (const stream of streams) {
      if (known.has(stream)) continue;
      // The common-practice default's name and rank; the safety officer can change both later.
      const { name, restrictiveness } = DEFAULT_STREAM_BY_ID[stream] ?? { name: stream, restrictiveness: 2 };
      await execute(
        "INSERT IGNORE INTO waste_streams (id, name, restrictiveness, created_at, updated_at) VALUES (?, ?, ?, NOW(3), NOW(3))",
        { replacements: [stream, name, restrictiveness], transaction },
      );
    }
  }
  for (const id of wanted) {
    if (present.has(id)) continue;
    const reagent = getReagent(id);
    if (!reagent) throw new HttpError(400, `reagent: ${id} is not in the catalogue`);
    await execute(
      "INSERT IGNORE INTO reagents (id, name, grades, unit, waste_stream_id, flammable, active, created_at, updated_at) VALUES (?, ?, '[]', ?, ?, ?, 1, NOW(3), NOW(3))",
      {
        replacements: [id, reagent.name, reagent.form === "solid" ? "g" : "mL", reagent.wasteStream.value, reagent.flammable ? 1 : 0],
        transaction,
      },
    );
  }
}

/**
 * Appends entries with multi-row INSERTs inside the caller's transaction. The entries are read
 * lazily, ROWS_PER_INSERT at a time, and the next statement's rows are prepared while the
 * database writes the last (`pipelinedWrites`).
 */
export async function appendEntries(entries: Iterable<NewLedgerEntry>, transaction: Transaction): Promise<void> {
  const now = new Date();
  await pipelinedWrites(transaction, async (send) => {
    let values: unknown[] = [];
    let rows = 0;
    const flush = async () => {
      await send(multiRowInsert("ledger_entries", COLUMNS, rows), values);
      values = [];
      rows = 0;
    };
    for (const e of entries) {
      values.push(
        e.occurredAt,
        e.projectId,
        e.kind,
        e.batchId,
        e.reagentId,
        e.volume_mL.toFixed(4),
        e.mass_g === null ? null : e.mass_g.toFixed(5),
        e.channel,
        e.wasteStreamId,
        e.wasteContainerId,
        e.sourceKind,
        e.sourceId,
        e.authorId,
        e.reversesId ?? null,
        e.reason ?? null,
        now,
      );
      if (++rows === ROWS_PER_INSERT) await flush();
    }
    if (rows > 0) await flush();
  });
}

interface LedgerRow {
  id: number;
  occurred_at: Date;
  kind: LedgerKind;
  project_code: string | null;
  batch_id: number | null;
  batch_code: string | null;
  reagent_id: string;
  reagent_name: string;
  volume_ml: number;
  mass_g: number | null;
  channel: string | null;
  waste_stream_id: string | null;
  waste_stream_name: string | null;
  container_code: string | null;
  source_kind: LedgerSource;
  source_id: string | null;
  author: string | null;
  reverses_id: number | null;
  reversed_by: number | null;
  reason: string | null;
}

const SELECT_LINES = `
  SELECT l.id, l.occurred_at, l.kind, p.code AS project_code, l.batch_id, b.code AS batch_code, l.reagent_id, g.name AS reagent_name,
         l.volume_ml, l.mass_g, l.channel, l.waste_stream_id, ws.name AS waste_stream_name, c.code AS container_code, l.source_kind, l.source_id, u.name AS author, l.reverses_id,
         r.id AS reversed_by, l.reason
    FROM ledger_entries l
    LEFT JOIN projects p ON p.id = l.project_id
    LEFT JOIN batches b ON b.id = l.batch_id
    JOIN reagents g ON g.id = l.reagent_id
    LEFT JOIN waste_streams ws ON ws.id = l.waste_stream_id
    LEFT JOIN waste_containers c ON c.id = l.waste_container_id
    LEFT JOIN users u ON u.id = l.author_id
    LEFT JOIN ledger_entries r ON r.reverses_id = l.id`;

const toLine = (r: LedgerRow): LedgerLine => ({
  id: r.id,
  occurredAt: new Date(r.occurred_at).toISOString(),
  kind: r.kind,
  projectCode: r.project_code,
  batchId: r.batch_id,
  batchCode: r.batch_code,
  reagentId: r.reagent_id,
  reagentName: r.reagent_name,
  volume_mL: r.volume_ml,
  mass_g: r.mass_g,
  channel: r.channel,
  wasteStreamId: r.waste_stream_id,
  wasteStreamName: r.waste_stream_name,
  wasteContainerCode: r.container_code,
  sourceKind: r.source_kind,
  sourceId: r.source_id,
  author: r.author,
  reversesId: r.reverses_id,
  reversedById: r.reversed_by,
  reason: r.reason,
});

/** Entries of a run (and their corrections), of a batch, or the latest ones. */
export async function listEntries(filter: {
  runId?: number | undefined;
  batchId?: number | undefined;
  limit?: number;
}): Promise<LedgerLine[]> {
  const where: string[] = [];
  const replacements: Record<string, unknown> = { limit: filter.limit ?? 200 };
  if (filter.runId !== undefined) {
    where.push("(l.source_id = :runSource OR l.reverses_id IN (SELECT x.id FROM ledger_entries x WHERE x.source_id = :runSource))");
    replacements.runSource = `run:${filter.runId}`;
  }
  if (filter.batchId !== undefined) {
    where.push("l.batch_id = :batchId");
    replacements.batchId = filter.batchId;
  }
  const rows = await select<LedgerRow>(
    `${SELECT_LINES} ${where.length ? `WHERE ${where.join(" AND ")}` : ""} ORDER BY l.id DESC LIMIT :limit`,
    {
      replacements,
    },
  );
  return rows.map(toLine);
}

/** Kinds whose entries took liquid out of a batch; reversing them puts it back. */
const DRAWN_FROM_BATCH = new Set<LedgerKind>(["run", "draw", "discard"]);

/**
 * Reverses entries (by id, or every entry of a run not yet reversed) in one transaction: a
 * correction per entry, the batches' remaining volume restored, one audit line.
 */
export async function reverseEntries(
  input: { entryIds: number[]; runId?: number | undefined; reason: string },
  actor: SignedInUser,
  ip: string | null = null,
): Promise<{ corrections: LedgerLine[] }> {
  const ids = await inTransaction(getSequelize(), (transaction) => reverseEntriesWithin(input, actor, ip, transaction));
  const rows = await select<LedgerRow>(`${SELECT_LINES} WHERE l.reverses_id IN (:ids) ORDER BY l.id`, { replacements: { ids } });
  return { corrections: rows.map(toLine) };
}

/**
 * The same in the caller's transaction (an undo reverses its action's entries with the rest of the
 * undo); `source`: every entry of one kind from one source (`bottle:12:2`). Returns the reversed ids.
 */
export async function reverseEntriesWithin(
  input: { entryIds: number[]; runId?: number | undefined; source?: { id: string; kind: LedgerKind }; reason: string },
  actor: SignedInUser,
  ip: string | null,
  transaction: Transaction,
): Promise<number[]> {
  const conditions: string[] = [];
  const replacements: Record<string, unknown> = {};
  if (input.entryIds.length) {
    conditions.push("l.id IN (:ids)");
    replacements.ids = input.entryIds;
  }
  if (input.runId !== undefined) {
    conditions.push("(l.source_id = :runSource AND l.kind = 'run')");
    replacements.runSource = `run:${input.runId}`;
  }
  if (input.source) {
    conditions.push("(l.source_id = :source AND l.kind = :sourceKind)");
    replacements.source = input.source.id;
    replacements.sourceKind = input.source.kind;
  }
  const originals = await select<LedgerRow & { project_id: number | null; waste_container_id: number | null; occurred_at: Date }>(
    `SELECT l.*, r.id AS reversed_by FROM ledger_entries l LEFT JOIN ledger_entries r ON r.reverses_id = l.id
        WHERE ${conditions.join(" OR ")} ORDER BY l.id FOR UPDATE`,
    { replacements, transaction },
  );
  const found = new Set(originals.map((o) => o.id));
  const missing = input.entryIds.filter((id) => !found.has(id));
  if (missing.length) throw new HttpError(404, `entryIds: no ledger entry ${missing.join(", ")}`);
  if (input.runId !== undefined && !originals.some((o) => o.source_id === `run:${input.runId}`))
    throw new HttpError(404, `runId: run ${input.runId} has no ledger entries`);
  const corrections = originals.filter((o) => o.kind === "correction" && input.entryIds.includes(o.id));
  if (corrections.length)
    throw new HttpError(
      400,
      `entryIds: entry ${corrections.map((c) => c.id).join(", ")} is itself a correction; corrections are not reversed`,
    );
  const already = originals.filter((o) => o.reversed_by !== null && input.entryIds.includes(o.id));
  if (already.length)
    throw new HttpError(
      409,
      `entryIds: entry ${already.map((a) => a.id).join(", ")} is already reversed (by entry ${already.map((a) => a.reversed_by).join(", ")})`,
    );
  const todo = originals.filter((o) => o.kind !== "correction" && o.reversed_by === null);
  if (todo.length === 0 && input.source) return [];
  if (todo.length === 0) throw new HttpError(409, "runId: every entry of this run is already reversed");

  // A correction to a period already invoiced for the client falls into the next open period.
  const openDates = new Map<string, Date>();
  for (const o of todo) {
    const key = `${o.project_id}|${new Date(o.occurred_at).toISOString()}`;
    if (!openDates.has(key)) openDates.set(key, await openDateForProject(o.project_id, new Date(o.occurred_at), transaction));
  }
  const reversing: NewLedgerEntry[] = todo.map((o) => ({
    occurredAt: openDates.get(`${o.project_id}|${new Date(o.occurred_at).toISOString()}`)!,
    projectId: o.project_id,
    kind: "correction",
    batchId: o.batch_id,
    reagentId: o.reagent_id,
    volume_mL: -o.volume_ml,
    mass_g: o.mass_g === null ? null : -o.mass_g,
    channel: o.channel,
    wasteStreamId: o.waste_stream_id,
    wasteContainerId: o.waste_container_id,
    sourceKind: "manual",
    sourceId: o.source_id,
    authorId: actor.id,
    reversesId: o.id,
    reason: input.reason,
  }));
  try {
    await appendEntries(reversing, transaction);
  } catch (error) {
    if (error instanceof Error && /Duplicate entry/i.test(`${error.message} ${(error as { parent?: Error }).parent?.message ?? ""}`))
      throw new HttpError(409, "entryIds: an entry was reversed by someone else just now; reload");
    throw error;
  }
  const backToBatch = new Map<number, number>();
  for (const o of todo)
    if (o.batch_id !== null && DRAWN_FROM_BATCH.has(o.kind)) backToBatch.set(o.batch_id, (backToBatch.get(o.batch_id) ?? 0) + o.volume_ml);
  for (const [batchId, volume] of backToBatch) {
    await execute("UPDATE batches SET remaining_ml = LEAST(volume_ml, remaining_ml + ?), updated_at = NOW(3) WHERE id = ?", {
      replacements: [volume.toFixed(4), batchId],
      transaction,
    });
  }
  const originalIds = todo.map((o) => o.id);
  await recordAudit(
    {
      actorId: actor.id,
      action: "ledger.correct",
      entity: input.runId !== undefined ? "run" : input.source ? "batch" : "ledger_entry",
      entityId: input.runId ?? originalIds[0] ?? null,
      ip,
      before: { entries: originalIds },
      after: { reason: input.reason, restored_mL: Object.fromEntries(backToBatch) },
    },
    transaction,
  );
  return originalIds;
}

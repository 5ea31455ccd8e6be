/**
 * Batches as runs, draws and imports take from them: loaded with what is in them, their volume
 * lowered, and what they have left afterwards.
 */
import type { Transaction } from "sequelize";
import { compositionFromSpec } from "../../ledger/composition";
import type { BatchForUse, RunProblem } from "../../ledger/plan-run";
import type { BatchComposition, CompositionPart } from "../../ledger/split";
import type { BatchLeft } from "../../ledger/types";
import { HttpError } from "../http";
import { execute, jsonColumn, select } from "../query";

interface BatchRow {
  id: number;
  code: string;
  status: string;
  prepared_at: Date;
  expires_at: Date;
  remaining_ml: number;
  volume_ml: number;
  spec: unknown;
}

/** Loads batches with their composition (recorded components, else the recipe's specification). */
export async function loadBatches(
  where: { ids?: number[]; codes?: string[] },
  transaction?: Transaction,
  lock = false,
): Promise<Map<number, BatchForUse>> {
  const ids = where.ids ?? [];
  const codes = where.codes ?? [];
  if (ids.length === 0 && codes.length === 0) return new Map();
  // Only the conditions that name something: with "OR code IN ('')" beside the ids, the optimizer may
  // scan the whole table, and FOR UPDATE would then lock every batch and not only those used.
  const conditions = [...(ids.length ? ["b.id IN (:ids)"] : []), ...(codes.length ? ["b.code IN (:codes)"] : [])];
  const rows = await select<BatchRow>(
    `SELECT b.id, b.code, b.status, b.prepared_at, b.expires_at, b.remaining_ml, b.volume_ml, v.spec
       FROM batches b JOIN recipe_versions v ON v.id = b.recipe_version_id
      WHERE ${conditions.join(" OR ")} ${lock ? "FOR UPDATE" : ""}`,
    { replacements: { ids, codes }, transaction },
  );
  const parts = rows.length
    ? await select<{ batch_id: number; reagent_id: string; unit: "mL" | "g"; amount: number }>(
        "SELECT batch_id, reagent_id, unit, COALESCE(actual_amount, target_amount) AS amount FROM batch_components WHERE batch_id IN (:ids) ORDER BY id",
        { replacements: { ids: rows.map((r) => r.id) }, transaction },
      )
    : [];
  const byBatch = new Map<number, CompositionPart[]>();
  for (const p of parts) {
    const list = byBatch.get(p.batch_id) ?? [];
    list.push({ reagentId: p.reagent_id, unit: p.unit, amount: p.amount });
    byBatch.set(p.batch_id, list);
  }
  const out = new Map<number, BatchForUse>();
  for (const r of rows) {
    let composition: BatchComposition = { volume_mL: r.volume_ml, parts: byBatch.get(r.id) ?? [] };
    if (composition.parts.length === 0) {
      try {
        composition = compositionFromSpec(jsonColumn(r.spec), r.volume_ml);
      } catch {
        // Left empty: planRun reports that the batch's composition is unknown.
      }
    }
    out.set(r.id, {
      id: r.id,
      code: r.code,
      status: r.status,
      preparedAt: new Date(r.prepared_at),
      expiresAt: new Date(r.expires_at),
      remaining_mL: r.remaining_ml,
      composition,
    });
  }
  return out;
}

/** Takes each batch's volume and moves a fresh batch to "in use"; the rows must be locked. */
export async function drawFromBatches(batchUse: ReadonlyMap<number, number>, transaction: Transaction) {
  for (const [batchId, volume] of batchUse) {
    await execute(
      "UPDATE batches SET status = IF(status = 'ready', 'in_use', status), remaining_ml = remaining_ml - ?, updated_at = NOW(3) WHERE id = ? AND remaining_ml >= ?",
      { replacements: [volume.toFixed(4), batchId, volume.toFixed(4)], transaction },
    );
  }
}

/** What is left in batches now. */
export async function batchesLeft(ids: number[]): Promise<BatchLeft[]> {
  if (ids.length === 0) return [];
  const rows = await select<{ id: number; code: string; remaining_ml: number; status: string }>(
    "SELECT id, code, remaining_ml, status FROM batches WHERE id IN (:ids) ORDER BY code",
    { replacements: { ids: [...new Set(ids)] } },
  );
  return rows.map((r) => ({ id: r.id, code: r.code, remaining_mL: r.remaining_ml, status: r.status }));
}

/** A 400 naming every problem, each under its field. */
export const problemsError = (problems: RunProblem[]) =>
  new HttpError(400, problems.map((p) => `${p.field}: ${p.message}`).join("; "), {
    fields: Object.fromEntries(problems.map((p) => [p.field, p.message])),
  });

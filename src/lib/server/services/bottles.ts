/**
 * One bottle of a batch (`POST /api/batches/:id/bottles/:number`): put in use, marked empty, or
 * discarded, what was left in it going to waste through "discard" ledger entries. Marking empty
 * and discarding can be undone within the undo window (`lib/undo.ts`): the discard's entries are
 * reversed by correction entries, the bottle goes back to the state it left.
 */
import { wasteStreamOf } from "../../ledger/split";
import type { Transaction } from "sequelize";
import type { BatchDetail, BottleStatus } from "../../preparation/types";
import { DEFAULT_STREAM_BY_ID } from "../../waste/streams";
import { recordAudit } from "../audit";
import { getSequelize } from "../db";
import type { SignedInUser } from "../guard";
import { HttpError } from "../http";
import { execute, select } from "../query";
import { getBatch } from "./batches";
import { appendEntries, reverseEntriesWithin } from "./ledger";
import { requireUndoWindow } from "./undo";
import { inTransaction } from "./sql";

/** The stream a discarded mix goes to: its most restrictive liquid's, by the common-practice ranking. */
function discardStream(liquids: BatchDetail["components"]): string | null {
  const rank = (stream: string) => DEFAULT_STREAM_BY_ID[stream]?.restrictiveness ?? 2;
  return (
    liquids
      .map((c) => wasteStreamOf(c.reagent))
      .filter((s): s is string => s !== null)
      .sort((a, b) => rank(b) - rank(a))[0] ?? null
  );
}

/** The batch's state from its bottles': all discarded, all done, any in use, or ready. */
async function setBatchStatus(batch: BatchDetail, number: number, status: BottleStatus, transaction: Transaction) {
  const statuses = batch.bottleList.map((b) => (b.number === number ? status : b.status));
  const batchStatus = statuses.every((s) => s === "discarded")
    ? "discarded"
    : statuses.every((s) => s === "empty" || s === "discarded")
      ? "empty"
      : statuses.some((s) => s === "in_use")
        ? "in_use"
        : "ready";
  await execute("UPDATE batches SET status = ?, updated_at = NOW(3) WHERE id = ?", { replacements: [batchStatus, batch.id], transaction });
}

/** Takes back marking a bottle empty or discarding it, within the undo window; a discard's entries are reversed. */
export async function undoBottle(batchId: number, number: number, actor: SignedInUser, ip: string | null = null): Promise<BatchDetail> {
  const batch = await getBatch(batchId);
  const bottle = batch.bottleList.find((b) => b.number === number);
  if (!bottle) throw new HttpError(404, `Batch ${batch.code} has no bottle ${number}.`);
  await inTransaction(getSequelize(), async (transaction) => {
    await select("SELECT id FROM batches WHERE id = ? FOR UPDATE", { replacements: [batchId], transaction });
    const [row] = await select<{ status: BottleStatus; previous_status: BottleStatus | null; changed_at: Date | null }>(
      "SELECT status, previous_status, changed_at FROM batch_bottles WHERE batch_id = ? AND number = ? FOR UPDATE",
      { replacements: [batchId, number], transaction },
    );
    if (!row || row.previous_status === null || (row.status !== "empty" && row.status !== "discarded"))
      throw new HttpError(409, `undo: bottle ${number} has nothing to undo`, { fields: { undo: "nothing to undo" } });
    const what = row.status === "discarded" ? `Discarding bottle ${number}` : `Marking bottle ${number} empty`;
    requireUndoWindow(row.changed_at ? new Date(row.changed_at) : null, what, "a discard is corrected from the batch's ledger entries.");
    const reversed = await reverseEntriesWithin(
      { entryIds: [], source: { id: `bottle:${batchId}:${number}`, kind: "discard" }, reason: `Undo: ${what.toLowerCase()}` },
      actor,
      ip,
      transaction,
    );
    await execute(
      `UPDATE batch_bottles SET status = previous_status, previous_status = NULL, changed_at = NULL, discarded_ml = NULL, updated_by = ?, updated_at = NOW(3)
        WHERE batch_id = ? AND number = ?`,
      { replacements: [actor.id, batchId, number], transaction },
    );
    await setBatchStatus(batch, number, row.previous_status, transaction);
    await recordAudit(
      {
        actorId: actor.id,
        action: "bottle-undo",
        entity: "batch",
        entityId: batchId,
        ip,
        before: { bottle: number, status: row.status },
        after: { bottle: number, status: row.previous_status, reversedEntries: reversed },
      },
      transaction,
    );
  });
  return getBatch(batchId);
}

/** Marks one bottle; discarding sends what was left in it to waste through "discard" ledger entries. */
export async function updateBottle(
  batchId: number,
  number: number,
  change: { status: "in_use" | "empty" | "discarded"; discarded_mL?: number | undefined; reason?: string | undefined },
  actor: SignedInUser,
  ip: string | null = null,
): Promise<BatchDetail> {
  const batch = await getBatch(batchId);
  const bottle = batch.bottleList.find((b) => b.number === number);
  if (!bottle) throw new HttpError(404, `Batch ${batch.code} has no bottle ${number}.`);
  if (bottle.status === "empty" || bottle.status === "discarded")
    throw new HttpError(409, `status: bottle ${number} is already ${bottle.status === "empty" ? "empty" : "discarded"}`);
  if (change.status === "in_use" && batch.expired)
    throw new HttpError(409, `status: batch ${batch.code} expired on ${batch.expiresAt.slice(0, 10)}; it cannot be put in use`);
  const share = Math.min(batch.bottleSize_mL, batch.volume_mL / batch.bottles);
  const discarded = change.status === "discarded" ? Math.min(change.discarded_mL ?? share, batch.remaining_mL) : 0;
  const now = new Date();
  await inTransaction(getSequelize(), async (transaction) => {
    await select("SELECT id FROM batches WHERE id = ? FOR UPDATE", { replacements: [batchId], transaction });
    await execute(
      `UPDATE batch_bottles SET status = ?, discarded_ml = ?, previous_status = ?, changed_at = ?, updated_by = ?, updated_at = NOW(3)
        WHERE batch_id = ? AND number = ?`,
      {
        replacements: [
          change.status,
          change.status === "discarded" ? discarded.toFixed(4) : null,
          change.status === "in_use" ? null : bottle.status,
          change.status === "in_use" ? null : now,
          actor.id,
          batchId,
          number,
        ],
        transaction,
      },
    );
    if (discarded > 0) {
      const liquids = batch.components.filter((c) => c.unit === "mL");
      const total = liquids.reduce((a, c) => a + (c.actual ?? c.target), 0) || 1;
      const stream = discardStream(liquids);
      await appendEntries(
        liquids.map((c) => ({
          occurredAt: now,
          projectId: null,
          kind: "discard" as const,
          batchId,
          reagentId: c.reagent,
          volume_mL: (discarded * (c.actual ?? c.target)) / total,
          mass_g: null,
          channel: null,
          wasteStreamId: stream,
          wasteContainerId: null,
          sourceKind: "manual" as const,
          sourceId: `bottle:${batchId}:${number}`,
          authorId: actor.id,
          reason: change.reason ?? null,
        })),
        transaction,
      );
      await execute("UPDATE batches SET remaining_ml = GREATEST(0, remaining_ml - ?) WHERE id = ?", {
        replacements: [discarded.toFixed(4), batchId],
        transaction,
      });
    }
    await setBatchStatus(batch, number, change.status, transaction);
    await recordAudit(
      {
        actorId: actor.id,
        action: `bottle-${change.status}`,
        entity: "batch",
        entityId: batchId,
        ip,
        before: { bottle: number, status: bottle.status },
        after: { bottle: number, status: change.status, discarded_mL: discarded || undefined, reason: change.reason },
      },
      transaction,
    );
  });
  return getBatch(batchId);
}

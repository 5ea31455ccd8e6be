/**
 * A manual withdrawal (`POST /api/draws`): a wash, a spill, a transfer taken from one batch with
 * its reason, split into ledger entries by the batch's composition.
 */
import { batchUnavailable, round4, type RunProblem } from "../../ledger/plan-run";
import { CompositionError, splitVolume, wasteStreamOf, type ReagentShare } from "../../ledger/split";
import type { DrawResult } from "../../ledger/types";
import type { DrawInput } from "../../schemas/runs";
import { recordAudit } from "../audit";
import type { SignedInUser } from "../guard";
import { withIdempotencyKey } from "../idempotency";
import { selectOne } from "../query";
import { drawFromBatches, loadBatches, problemsError } from "./batch-use";
import { appendEntries, ensureCatalogueRows } from "./ledger";

/** A manual withdrawal from one batch, with its reason; the same idempotency key again answers the first result. */
export async function logDraw(input: DrawInput, actor: SignedInUser, ip: string | null = null): Promise<DrawResult> {
  const occurredAt = input.occurredAt ?? new Date();
  const { value, replayed } = await withIdempotencyKey("draw", input.idempotencyKey, async (transaction) => {
    const batches = await loadBatches({ ids: [input.batchId] }, transaction, true);
    const batch = batches.get(input.batchId);
    const problems: RunProblem[] = [];
    if (!batch) throw problemsError([{ field: "batchId", message: `no batch with id ${input.batchId}` }]);
    const unavailable = batchUnavailable(batch);
    if (unavailable) problems.push({ field: "batchId", message: unavailable });
    if (batch.remaining_mL < input.volume_mL)
      problems.push({ field: "volume_mL", message: `batch ${batch.code} has ${round4(batch.remaining_mL)} mL left` });
    if (input.projectId !== undefined) {
      const project = await selectOne("SELECT id FROM projects WHERE id = ? AND status <> 'closed'", {
        replacements: [input.projectId],
        transaction,
      });
      if (!project) problems.push({ field: "projectId", message: "no open project with this id" });
    }
    if (input.wasteContainerId !== undefined) {
      const container = await selectOne("SELECT id FROM waste_containers WHERE id = ? AND status <> 'collected'", {
        replacements: [input.wasteContainerId],
        transaction,
      });
      if (!container) problems.push({ field: "wasteContainerId", message: "no waste container in use with this id" });
    }
    let shares: ReagentShare[] = [];
    try {
      shares = splitVolume(input.volume_mL, batch.composition);
    } catch (error) {
      if (!(error instanceof CompositionError)) throw error;
      problems.push({ field: "batchId", message: `batch ${batch.code}: ${error.message}` });
    }
    if (problems.length) throw problemsError(problems);
    const reason = input.note ? `${input.purpose}: ${input.note}` : input.purpose;
    await ensureCatalogueRows(
      shares.map((s) => s.reagentId),
      transaction,
    );
    await appendEntries(
      shares.map((s) => ({
        occurredAt,
        projectId: input.projectId ?? null,
        kind: "draw" as const,
        batchId: batch.id,
        reagentId: s.reagentId,
        volume_mL: s.volume_mL,
        mass_g: s.mass_g,
        channel: null,
        wasteStreamId: wasteStreamOf(s.reagentId),
        wasteContainerId: input.wasteContainerId ?? null,
        sourceKind: "manual" as const,
        sourceId: `draw:${input.idempotencyKey}`,
        authorId: actor.id,
        reason,
      })),
      transaction,
    );
    await drawFromBatches(new Map([[batch.id, input.volume_mL]]), transaction);
    const result: DrawResult = {
      batchCode: batch.code,
      volume_mL: input.volume_mL,
      remaining_mL: round4(batch.remaining_mL - input.volume_mL),
      entries: shares.length,
      replayed: false,
    };
    await recordAudit(
      {
        actorId: actor.id,
        action: "draw.log",
        entity: "batch",
        entityId: batch.id,
        ip,
        before: { remaining_mL: round4(batch.remaining_mL), status: batch.status },
        after: {
          remaining_mL: result.remaining_mL,
          volume_mL: input.volume_mL,
          purpose: input.purpose,
          note: input.note,
          projectId: input.projectId ?? null,
          wasteContainerId: input.wasteContainerId ?? null,
          ledgerEntries: shares.length,
        },
      },
      transaction,
    );
    return result;
  });
  return { ...value, replayed };
}

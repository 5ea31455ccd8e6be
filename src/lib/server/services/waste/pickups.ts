// Pickups: requested for full or in-use containers, then recorded as collected (/waste/pickups, /api/waste/pickups).
import type { Transaction } from "sequelize";
import type { CollectionInput, PickupRequest } from "../../../schemas/waste";
import type { PickupView } from "../../../waste/types";
import { getSequelize } from "../../db";
import { HttpError } from "../../http";
import { Pickup, WasteContainer } from "../../models/waste";
import { execute, select, selectOne } from "../../query";
import { inTransaction } from "../sql";
import { auditWaste, type WasteActor } from "./audit";
import { estimateAt, listContainers } from "./containers";

/** Open pickups first, then the newest; each with its containers. */
export async function listPickups(): Promise<PickupView[]> {
  const pickups = await select<{
    id: number;
    reference: string | null;
    status: PickupView["status"];
    requested_at: Date;
    requested_by: string | null;
    collected_at: Date | null;
    manifest_ref: string | null;
    note: string | null;
  }>(
    `SELECT p.id, p.reference, p.status, p.requested_at, u.name AS requested_by, p.collected_at, p.manifest_ref, p.note
       FROM pickups p LEFT JOIN users u ON u.id = p.requested_by ORDER BY p.status = 'requested' DESC, p.requested_at DESC, p.id DESC`,
  );
  const containers = await listContainers({ includeCollected: true });
  return pickups.map((p) => ({
    id: p.id,
    reference: p.reference,
    status: p.status,
    requestedAt: p.requested_at.toISOString(),
    requestedBy: p.requested_by,
    collectedAt: p.collected_at?.toISOString() ?? null,
    manifestRef: p.manifest_ref,
    note: p.note,
    containers: containers
      .filter((c) => c.pickupId === p.id)
      .map((c) => ({ id: c.id, code: c.code, stream: c.stream, estimated_mL: c.estimated_mL })),
  }));
}

async function getPickup(id: number): Promise<PickupView> {
  return (await listPickups()).find((p) => p.id === id)!;
}

/** PU-<year>-<nnn>: the year's pickups so far, plus one. */
async function nextPickupReference(now: Date, transaction: Transaction): Promise<string> {
  const year = now.getUTCFullYear();
  const row = await selectOne<{ n: number }>("SELECT COUNT(*) AS n FROM pickups WHERE reference LIKE :prefix", {
    replacements: { prefix: `PU-${year}-%` },
    transaction,
  });
  return `PU-${year}-${String((row?.n ?? 0) + 1).padStart(3, "0")}`;
}

/** Requests a pickup for containers that are full or in use: they wait for collection and take no more waste. */
export async function requestPickup(input: PickupRequest, ctx: WasteActor): Promise<PickupView> {
  const now = new Date();
  const pickupId = await inTransaction(getSequelize(), async (transaction) => {
    const containers = await WasteContainer.findAll({ where: { id: input.containerIds }, transaction, lock: transaction.LOCK.UPDATE });
    for (const id of input.containerIds) {
      const c = containers.find((x) => x.id === id);
      if (!c) throw new HttpError(400, `containerIds: no container with id ${id}`);
      if (c.status === "awaiting_pickup" || c.status === "collected")
        throw new HttpError(409, `containerIds: ${c.code} is already ${c.status === "collected" ? "collected" : "waiting for a pickup"}`);
    }
    const pickup = await Pickup.create(
      {
        reference: await nextPickupReference(now, transaction),
        status: "requested",
        requestedAt: now,
        requestedBy: ctx.actor.id,
        collectedAt: null,
        manifestRef: null,
        note: input.note,
        recordedBy: null,
      },
      { transaction },
    );
    for (const c of containers) {
      const before = { status: c.status };
      await c.update({ status: "awaiting_pickup", pickupId: pickup.id, fullAt: c.fullAt ?? now }, { transaction });
      // It takes no more waste: the instrument it served is unhooked and needs a fresh container.
      await execute("UPDATE instruments SET waste_container_id = NULL WHERE waste_container_id = :id", {
        replacements: { id: c.id },
        transaction,
      });
      const after = { status: "awaiting_pickup", pickup: pickup.reference };
      await auditWaste(ctx, { action: "waste.container.status", entity: "waste_container", entityId: c.id, before, after }, transaction);
    }
    const after = { reference: pickup.reference, containers: containers.map((c) => c.code), note: input.note };
    await auditWaste(ctx, { action: "waste.pickup.request", entity: "pickup", entityId: pickup.id, after }, transaction);
    return pickup.id;
  });
  return getPickup(pickupId);
}

/** Records the collection: the containers leave the live totals and stay in the history. */
export async function recordCollection(pickupId: number, input: CollectionInput, ctx: WasteActor): Promise<PickupView> {
  const collectedAt = input.collectedAt ? new Date(input.collectedAt) : new Date();
  if (collectedAt.getTime() > Date.now() + 5 * 60_000) throw new HttpError(400, "collectedAt: cannot be in the future");
  await inTransaction(getSequelize(), async (transaction) => {
    const pickup = await Pickup.findByPk(pickupId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!pickup) throw new HttpError(404, `No pickup with id ${pickupId}.`);
    if (pickup.status !== "requested") throw new HttpError(409, `Pickup ${pickup.reference ?? pickup.id} is ${pickup.status} already.`);
    if (collectedAt < pickup.requestedAt) throw new HttpError(400, "collectedAt: before the pickup was requested");
    const containers = await WasteContainer.findAll({ where: { pickupId }, transaction, lock: transaction.LOCK.UPDATE });
    for (const c of containers) {
      const estimate = await estimateAt(c.id, collectedAt, transaction);
      await c.update({ status: "collected", collectedAt, estimatedVolumeMl: estimate }, { transaction });
      await auditWaste(
        ctx,
        {
          action: "waste.container.status",
          entity: "waste_container",
          entityId: c.id,
          before: { status: "awaiting_pickup" },
          after: { status: "collected", manifestRef: input.manifestRef, estimated_mL: estimate },
        },
        transaction,
      );
    }
    await pickup.update(
      { status: "collected", collectedAt, manifestRef: input.manifestRef, note: input.note ?? pickup.note, recordedBy: ctx.actor.id },
      { transaction },
    );
    await auditWaste(
      ctx,
      {
        action: "waste.pickup.collected",
        entity: "pickup",
        entityId: pickupId,
        before: { status: "requested" },
        after: {
          status: "collected",
          manifestRef: input.manifestRef,
          collectedAt: collectedAt.toISOString(),
          containers: containers.map((c) => c.code),
        },
      },
      transaction,
    );
  });
  return getPickup(pickupId);
}

// Waste containers and their live estimates (/waste/containers, /api/waste/containers).
//
// A container's live estimate is derived, never typed in: the last level reading in the current
// accumulation (or 0 at its start) plus every ledger entry routed to the container since. The
// column waste_containers.estimated_volume_ml is only a cache of that figure (kept for readers
// that want a plain column, and frozen when a container is collected).
import type { Transaction } from "sequelize";
import type { ContainerInput } from "../../../schemas/waste";
import { accumulationState, containerAlerts, fillState } from "../../../waste/alerts";
import type { ContainerStatus, ContainerView, InstrumentChoice, LocationKind, WasteSettings } from "../../../waste/types";
import { getSequelize } from "../../db";
import { HttpError } from "../../http";
import { WasteContainer, WasteStream } from "../../models/waste";
import { execute, select, selectOne } from "../../query";
import { inTransaction } from "../sql";
import { auditWaste, type WasteActor } from "./audit";
import { readWasteSettings } from "./settings";

interface ContainerRow {
  id: number;
  code: string;
  stream_id: string;
  stream_name: string;
  capacity_ml: number;
  estimated_volume_ml: number;
  room: string;
  location_kind: LocationKind;
  location_note: string | null;
  status: ContainerStatus;
  accumulation_started_at: Date | null;
  full_at: Date | null;
  collected_at: Date | null;
  pickup_id: number | null;
  pickup_reference: string | null;
  instrument_id: number | null;
  instrument_name: string | null;
  last_level: number | null;
  last_read_at: Date | null;
  /** The ledger since the last reading; null when nothing was added. */
  added: number | null;
}

// The live estimate in SQL: last reading of the current accumulation (or 0) + the ledger since.
const CONTAINER_SELECT = `
  SELECT c.id, c.code, c.stream_id, s.name AS stream_name, c.capacity_ml, c.estimated_volume_ml, c.room, c.location_kind,
         c.location_note, c.status, c.accumulation_started_at, c.full_at, c.collected_at, c.pickup_id, p.reference AS pickup_reference,
         i.id AS instrument_id, i.name AS instrument_name, lr.level_ml AS last_level, lr.read_at AS last_read_at,
         (SELECT SUM(l.volume_ml) FROM ledger_entries l
           WHERE l.waste_container_id = c.id
             AND (c.accumulation_started_at IS NULL OR l.occurred_at >= c.accumulation_started_at)
             AND (lr.read_at IS NULL OR l.occurred_at > lr.read_at)
             AND l.occurred_at <= :at) AS added
    FROM waste_containers c
    JOIN waste_streams s ON s.id = c.stream_id
    LEFT JOIN pickups p ON p.id = c.pickup_id
    LEFT JOIN instruments i ON i.id = (SELECT MIN(i2.id) FROM instruments i2 WHERE i2.waste_container_id = c.id)
    LEFT JOIN waste_readings lr ON lr.id = (
      SELECT r2.id FROM waste_readings r2
       WHERE r2.container_id = c.id AND r2.read_at <= :at
         AND (c.accumulation_started_at IS NULL OR r2.read_at >= c.accumulation_started_at)
       ORDER BY r2.read_at DESC, r2.id DESC LIMIT 1)`;

const liveEstimate = (row: ContainerRow) => (row.last_level ?? 0) + (row.added ?? 0);
const instant = (d: Date | null) => d?.toISOString() ?? null;

function containerView(row: ContainerRow, settings: WasteSettings, now: Date): ContainerView {
  // A collected container keeps the figure it left with; a live one is estimated afresh.
  const estimated = row.status === "collected" ? row.estimated_volume_ml : liveEstimate(row);
  const started = row.accumulation_started_at;
  const acc = started && row.status !== "collected" ? accumulationState(started, now, settings) : null;
  return {
    id: row.id,
    code: row.code,
    streamId: row.stream_id,
    stream: row.stream_name,
    capacity_mL: row.capacity_ml,
    estimated_mL: Math.round(estimated * 10) / 10,
    fill: fillState(estimated, row.capacity_ml, settings.fullThreshold_percent),
    room: row.room,
    locationKind: row.location_kind,
    locationNote: row.location_note,
    status: row.status,
    accumulationStartedAt: instant(started),
    accumulation: acc ? { ...acc, limitAt: acc.limitAt.toISOString() } : null,
    fullAt: instant(row.full_at),
    collectedAt: instant(row.collected_at),
    pickupId: row.pickup_id,
    pickupReference: row.pickup_reference,
    instrument: row.instrument_id ? { id: row.instrument_id, name: row.instrument_name ?? "" } : null,
    lastReading: row.last_read_at ? { at: row.last_read_at.toISOString(), level_mL: row.last_level ?? 0 } : null,
    alerts: containerAlerts(
      { status: row.status, capacity_mL: row.capacity_ml, estimated_mL: estimated, accumulationStartedAt: started },
      settings,
      now,
    ),
  };
}

const STATUS_ORDER: Record<ContainerStatus, number> = { full: 0, in_use: 1, awaiting_pickup: 2, collected: 3 };

/** Containers with live estimates; live ones (not collected) unless `includeCollected`. Fullest first within a status. */
export async function listContainers(
  options: { includeCollected?: boolean; now?: Date; transaction?: Transaction } = {},
): Promise<ContainerView[]> {
  const now = options.now ?? new Date();
  const settings = await readWasteSettings(options.transaction);
  const rows = await select<ContainerRow>(`${CONTAINER_SELECT} ${options.includeCollected ? "" : "WHERE c.status <> 'collected'"}`, {
    replacements: { at: now },
    transaction: options.transaction,
  });
  return rows
    .map((r) => containerView(r, settings, now))
    .sort((a, b) => STATUS_ORDER[a.status] - STATUS_ORDER[b.status] || b.fill.percent - a.fill.percent || a.code.localeCompare(b.code));
}

async function containerRow(id: number, at: Date, transaction?: Transaction): Promise<ContainerRow> {
  const row = await selectOne<ContainerRow>(`${CONTAINER_SELECT} WHERE c.id = :id`, { replacements: { at, id }, transaction });
  if (!row) throw new HttpError(404, `No waste container with id ${id}.`);
  return row;
}

export async function getContainer(id: number, options: { now?: Date; transaction?: Transaction } = {}): Promise<ContainerView> {
  const now = options.now ?? new Date();
  const settings = await readWasteSettings(options.transaction);
  return containerView(await containerRow(id, now, options.transaction), settings, now);
}

/** The live estimate of one container at an instant (used to record a reading's difference). */
export async function estimateAt(id: number, at: Date, transaction?: Transaction): Promise<number> {
  return liveEstimate(await containerRow(id, at, transaction));
}

function containerSnapshot(c: WasteContainer, instrumentId: number | null) {
  return {
    code: c.code,
    streamId: c.streamId,
    capacity_mL: c.capacityMl,
    room: c.room,
    locationKind: c.locationKind,
    locationNote: c.locationNote,
    status: c.status,
    instrumentId,
  };
}

async function linkInstrument(containerId: number, instrumentId: number | null, transaction: Transaction) {
  if (instrumentId !== null) {
    const instrument = await selectOne<{ id: number }>("SELECT id FROM instruments WHERE id = :instrumentId", {
      replacements: { instrumentId },
      transaction,
    });
    if (!instrument) throw new HttpError(400, `instrumentId: no instrument with id ${instrumentId}`);
  }
  // An instrument drains to one container at a time, and here a container serves one instrument.
  await execute(
    "UPDATE instruments SET waste_container_id = NULL WHERE waste_container_id = :containerId AND (:instrumentId IS NULL OR id <> :instrumentId)",
    { replacements: { containerId, instrumentId }, transaction },
  );
  if (instrumentId !== null)
    await execute("UPDATE instruments SET waste_container_id = :containerId WHERE id = :instrumentId", {
      replacements: { containerId, instrumentId },
      transaction,
    });
}

async function servedInstrument(containerId: number, transaction?: Transaction): Promise<number | null> {
  const row = await selectOne<{ id: number | null }>("SELECT MIN(id) AS id FROM instruments WHERE waste_container_id = :containerId", {
    replacements: { containerId },
    transaction,
  });
  return row?.id ?? null;
}

async function requireStream(streamId: string, transaction: Transaction) {
  if (!(await WasteStream.findByPk(streamId, { transaction }))) throw new HttpError(400, `streamId: no stream "${streamId}"`);
}

async function requireFreeCode(code: string, transaction: Transaction) {
  if (await WasteContainer.findOne({ where: { code }, transaction })) throw new HttpError(409, `code: a container ${code} exists already`);
}

const placeOf = (input: ContainerInput) => ({
  code: input.code,
  streamId: input.streamId,
  capacityMl: input.capacity_mL,
  room: input.room,
  locationKind: input.locationKind,
  locationNote: input.locationNote,
});

export async function createContainer(input: ContainerInput, ctx: WasteActor): Promise<ContainerView> {
  const id = await inTransaction(getSequelize(), async (transaction) => {
    await requireStream(input.streamId, transaction);
    await requireFreeCode(input.code, transaction);
    const container = await WasteContainer.create(
      { ...placeOf(input), status: "in_use", accumulationStartedAt: new Date(), fullAt: null, collectedAt: null, pickupId: null },
      { transaction },
    );
    await linkInstrument(container.id, input.instrumentId, transaction);
    const after = containerSnapshot(container, input.instrumentId);
    await auditWaste(ctx, { action: "waste.container.create", entity: "waste_container", entityId: container.id, after }, transaction);
    return container.id;
  });
  return getContainer(id);
}

export async function updateContainer(id: number, input: ContainerInput, ctx: WasteActor): Promise<ContainerView> {
  await inTransaction(getSequelize(), async (transaction) => {
    const container = await WasteContainer.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!container) throw new HttpError(404, `No waste container with id ${id}.`);
    if (container.status === "collected") throw new HttpError(409, `${container.code} was collected; it stays in the history as it was.`);
    await requireStream(input.streamId, transaction);
    if (input.code !== container.code) await requireFreeCode(input.code, transaction);
    if (input.streamId !== container.streamId && (await estimateAt(id, new Date(), transaction)) > 0) {
      throw new HttpError(409, `streamId: ${container.code} already holds waste of its stream; start a new container for another stream.`);
    }
    const before = containerSnapshot(container, await servedInstrument(id, transaction));
    await container.update(placeOf(input), { transaction });
    await linkInstrument(id, input.instrumentId, transaction);
    const after = containerSnapshot(container, input.instrumentId);
    await auditWaste(ctx, { action: "waste.container.update", entity: "waste_container", entityId: id, before, after }, transaction);
  });
  return getContainer(id);
}

/** Marks a container full (it then takes no more runs) or back in use. */
export async function setContainerStatus(id: number, status: "in_use" | "full", ctx: WasteActor): Promise<ContainerView> {
  await inTransaction(getSequelize(), async (transaction) => {
    const container = await WasteContainer.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!container) throw new HttpError(404, `No waste container with id ${id}.`);
    if (container.status === "awaiting_pickup" || container.status === "collected") {
      throw new HttpError(409, `status: ${container.code} is ${container.status.replace("_", " ")}; its pickup sets its state.`);
    }
    if (container.status === status) return;
    const before = { status: container.status, fullAt: instant(container.fullAt) };
    await container.update({ status, fullAt: status === "full" ? new Date() : null }, { transaction });
    const after = { status, fullAt: instant(container.fullAt) };
    await auditWaste(ctx, { action: "waste.container.status", entity: "waste_container", entityId: id, before, after }, transaction);
  });
  return getContainer(id);
}

/** The active instruments the container form offers, with the container each drains to now. */
export async function instrumentChoices(): Promise<InstrumentChoice[]> {
  const rows = await select<{ id: number; name: string; room: string; waste_container_id: number | null; code: string | null }>(
    "SELECT i.id, i.name, i.room, i.waste_container_id, c.code FROM instruments i LEFT JOIN waste_containers c ON c.id = i.waste_container_id WHERE i.active = 1 ORDER BY i.name",
  );
  return rows.map((r) => ({ id: r.id, name: r.name, room: r.room, containerId: r.waste_container_id, containerCode: r.code }));
}

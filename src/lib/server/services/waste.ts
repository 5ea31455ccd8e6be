// Waste: streams and their routing rules, containers and their live estimates, readings, alerts,
// pickups, the period totals the safety officer reviews, and flammables on hand.
//
// A container's live estimate is derived, never typed in: the last level reading in the current
// accumulation (or 0 at its start) plus every ledger entry routed to the container since. The
// column waste_containers.estimated_volume_ml is only a cache of that figure (kept for readers
// that want a plain column, and frozen when a container is collected).
import { QueryTypes, type Transaction } from "sequelize";
import {
  accumulationState,
  containerAlerts,
  EXAMPLE_LIMITS,
  fillState,
  type AccumulationInfo,
  type AlertKind,
  type FillInfo,
  type WasteLimits,
} from "../../waste/alerts";
import { monthsIn, periodBounds, type Period } from "../../waste/period";
import {
  assignWasteStream,
  DEFAULT_STREAM_BY_ID,
  streamAccepts,
  type MixPart,
  type StreamAssignment,
  type StreamRule,
} from "../../waste/streams";
import type {
  CollectionInput,
  ContainerInput,
  PickupRequest,
  ReadingInput,
  StreamInput,
  StreamUpdate,
  WasteSettingsInput,
} from "../../schemas/waste";
import { recordAudit } from "../audit";
import { getSequelize } from "../db";
import { getReagent } from "../../chem";
import type { ContainerLabelContent } from "../../waste/container-label";
import { containerHazards } from "../../waste/hazards";
import type { ReportData } from "../../waste/report";
import { HttpError } from "../http";
import { Setting } from "../models/audit";
import { Pickup, WasteContainer, WasteReading, WasteStream, type ContainerStatus } from "../models/waste";
import { inTransaction } from "./sql";

interface Actor {
  id: number;
}
interface Context {
  actor: Actor;
  ip?: string | null | undefined;
}

const db = () => getSequelize();
const num = (v: unknown) => (v === null || v === undefined ? 0 : Number(v));
const iso = (d: Date | string | null) => (d ? new Date(d).toISOString() : null);

// ── Settings ───────────────────────────────────────────────────────────────────────────────

export interface WasteSettings extends WasteLimits {
  /** Room → litres of flammable liquids allowed (example values; fire codes and the institution decide). */
  roomLimits_L: Record<string, number>;
  /** Reagent id → stream id, where the site routes a reagent differently from the catalogue. */
  reagentStreams: Record<string, string>;
}

const SETTING_KEYS = {
  fullThreshold_percent: "waste.fullThreshold_percent",
  accumulationLimit_days: "waste.accumulationLimit_days",
  accumulationWarning_days: "waste.accumulationWarning_days",
  roomLimits_L: "flammables.roomLimit_L",
  reagentStreams: "waste.reagentStreams",
} as const;

const asNumber = (v: unknown, fallback: number) =>
  typeof v === "number" && Number.isFinite(v)
    ? v
    : typeof v === "string" && v.trim() !== "" && Number.isFinite(Number(v))
      ? Number(v)
      : fallback;
const asRecord = <T>(v: unknown, pick: (x: unknown) => T | undefined): Record<string, T> => {
  if (typeof v === "string") {
    try {
      v = JSON.parse(v);
    } catch {
      return {};
    }
  }
  if (!v || typeof v !== "object" || Array.isArray(v)) return {};
  const out: Record<string, T> = {};
  for (const [k, x] of Object.entries(v)) {
    const picked = pick(x);
    if (picked !== undefined) out[k] = picked;
  }
  return out;
};

/** The waste limits and room limits; a missing setting takes its example value. */
export async function readWasteSettings(transaction?: Transaction): Promise<WasteSettings> {
  const rows = await Setting.findAll({ where: { key: Object.values(SETTING_KEYS) }, transaction });
  const value = (key: string) => rows.find((r) => r.key === key)?.value;
  return {
    fullThreshold_percent: asNumber(value(SETTING_KEYS.fullThreshold_percent), EXAMPLE_LIMITS.fullThreshold_percent),
    accumulationLimit_days: asNumber(value(SETTING_KEYS.accumulationLimit_days), EXAMPLE_LIMITS.accumulationLimit_days),
    accumulationWarning_days: asNumber(value(SETTING_KEYS.accumulationWarning_days), EXAMPLE_LIMITS.accumulationWarning_days),
    roomLimits_L: asRecord(value(SETTING_KEYS.roomLimits_L), (x) => (Number.isFinite(Number(x)) ? Number(x) : undefined)),
    reagentStreams: asRecord(value(SETTING_KEYS.reagentStreams), (x) => (typeof x === "string" ? x : undefined)),
  };
}

export async function updateWasteSettings(input: WasteSettingsInput, ctx: Context): Promise<WasteSettings> {
  const streams = new Set((await WasteStream.findAll({ attributes: ["id"] })).map((s) => s.id));
  for (const [reagent, stream] of Object.entries(input.reagentStreams)) {
    if (!streams.has(stream)) throw new HttpError(400, `reagentStreams.${reagent}: no stream "${stream}"`);
  }
  return inTransaction(db(), async (transaction) => {
    const before = await readWasteSettings(transaction);
    for (const [field, key] of Object.entries(SETTING_KEYS) as [keyof typeof SETTING_KEYS, string][]) {
      await Setting.upsert({ key, value: input[field], updatedBy: ctx.actor.id }, { transaction });
    }
    const after = await readWasteSettings(transaction);
    await recordAudit(
      { actorId: ctx.actor.id, action: "waste.settings.update", entity: "settings", entityId: "waste", ip: ctx.ip ?? null, before, after },
      transaction,
    );
    return after;
  });
}

// ── Streams ────────────────────────────────────────────────────────────────────────────────

export interface StreamView extends StreamRule {
  description: string | null;
  /** True where the threshold or the accepted streams are the common-practice default. */
  defaultMinShare: boolean;
  defaultAlsoAccepts: boolean;
  /** The common-practice basis of the default, when Decant knows one. */
  basis: string | null;
  containers: number;
}

function ruleOf(row: WasteStream): StreamRule & { defaultMinShare: boolean; defaultAlsoAccepts: boolean } {
  const d = DEFAULT_STREAM_BY_ID[row.id];
  return {
    id: row.id,
    name: row.name,
    restrictiveness: row.restrictiveness,
    minShare_percent: row.minSharePercent !== null ? Number(row.minSharePercent) : (d?.minShare_percent ?? 0),
    alsoAccepts: Array.isArray(row.alsoAccepts) ? row.alsoAccepts : (d?.alsoAccepts ?? []),
    defaultMinShare: row.minSharePercent === null,
    defaultAlsoAccepts: !Array.isArray(row.alsoAccepts),
  };
}

/** The site's streams with their effective rules, most restrictive first. */
export async function listStreams(transaction?: Transaction): Promise<StreamView[]> {
  const rows = await WasteStream.findAll({
    order: [
      ["restrictiveness", "DESC"],
      ["id", "ASC"],
    ],
    transaction,
  });
  const counts = await db().query<{ stream_id: string; n: number }>(
    "SELECT stream_id, COUNT(*) AS n FROM waste_containers WHERE status <> 'collected' GROUP BY stream_id",
    { type: QueryTypes.SELECT, transaction },
  );
  return rows.map((row) => ({
    ...ruleOf(row),
    description: row.description,
    basis: DEFAULT_STREAM_BY_ID[row.id]?.basis ?? null,
    containers: num(counts.find((c) => c.stream_id === row.id)?.n),
  }));
}

async function streamRules(transaction?: Transaction): Promise<StreamRule[]> {
  return (await WasteStream.findAll({ transaction })).map(ruleOf);
}

function streamSnapshot(row: WasteStream) {
  return {
    name: row.name,
    description: row.description,
    restrictiveness: row.restrictiveness,
    minShare_percent: row.minSharePercent === null ? null : Number(row.minSharePercent),
    alsoAccepts: row.alsoAccepts,
  };
}

export async function createStream(input: StreamInput, ctx: Context): Promise<StreamView> {
  await inTransaction(db(), async (transaction) => {
    if (await WasteStream.findByPk(input.id, { transaction })) throw new HttpError(409, `id: a stream "${input.id}" exists already`);
    await checkAccepted(input.alsoAccepts, input.id, transaction);
    const row = await WasteStream.create(
      {
        id: input.id,
        name: input.name,
        description: input.description,
        restrictiveness: input.restrictiveness,
        minSharePercent: input.minShare_percent,
        alsoAccepts: input.alsoAccepts,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: ctx.actor.id,
        action: "waste.stream.create",
        entity: "waste_stream",
        entityId: row.id,
        ip: ctx.ip ?? null,
        after: streamSnapshot(row),
      },
      transaction,
    );
  });
  return (await listStreams()).find((s) => s.id === input.id)!;
}

async function checkAccepted(ids: readonly string[] | null, self: string, transaction: Transaction) {
  if (!ids) return;
  const known = new Set((await WasteStream.findAll({ attributes: ["id"], transaction })).map((s) => s.id));
  known.add(self);
  for (const id of ids) if (!known.has(id)) throw new HttpError(400, `alsoAccepts: no stream "${id}"`);
}

export async function updateStream(id: string, input: StreamUpdate, ctx: Context): Promise<StreamView> {
  await inTransaction(db(), async (transaction) => {
    const row = await WasteStream.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw new HttpError(404, `No waste stream "${id}".`);
    await checkAccepted(input.alsoAccepts, id, transaction);
    const before = streamSnapshot(row);
    await row.update(
      {
        name: input.name,
        description: input.description,
        restrictiveness: input.restrictiveness,
        minSharePercent: input.minShare_percent,
        alsoAccepts: input.alsoAccepts,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: ctx.actor.id,
        action: "waste.stream.update",
        entity: "waste_stream",
        entityId: id,
        ip: ctx.ip ?? null,
        before,
        after: streamSnapshot(row),
      },
      transaction,
    );
  });
  return (await listStreams()).find((s) => s.id === id)!;
}

/** The stream a mix goes to under this site's rules and reagent overrides. */
export async function wasteStreamForMix(parts: readonly MixPart[], transaction?: Transaction): Promise<StreamAssignment> {
  const [rules, settings] = await Promise.all([streamRules(transaction), readWasteSettings(transaction)]);
  return assignWasteStream(parts, rules, settings.reagentStreams);
}

// ── Containers ─────────────────────────────────────────────────────────────────────────────

export interface ContainerView {
  id: number;
  code: string;
  streamId: string;
  stream: string;
  capacity_mL: number;
  estimated_mL: number;
  fill: FillInfo;
  room: string;
  locationKind: "room" | "satellite_area" | "instrument";
  locationNote: string | null;
  status: ContainerStatus;
  accumulationStartedAt: string | null;
  accumulation: (Omit<AccumulationInfo, "limitAt"> & { limitAt: string }) | null;
  fullAt: string | null;
  collectedAt: string | null;
  pickupId: number | null;
  pickupReference: string | null;
  /** The instrument draining into this container, if any. */
  instrument: { id: number; name: string } | null;
  lastReading: { at: string; level_mL: number } | null;
  alerts: AlertKind[];
}

interface ContainerRow {
  id: number;
  code: string;
  stream_id: string;
  stream_name: string;
  capacity_ml: number;
  estimated_volume_ml: string;
  room: string;
  location_kind: ContainerView["locationKind"];
  location_note: string | null;
  status: ContainerStatus;
  accumulation_started_at: Date | null;
  full_at: Date | null;
  collected_at: Date | null;
  pickup_id: number | null;
  pickup_reference: string | null;
  instrument_id: number | null;
  instrument_name: string | null;
  last_level: string | null;
  last_read_at: Date | null;
  added: string | null;
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

function containerView(row: ContainerRow, settings: WasteSettings, now: Date): ContainerView {
  // A collected container keeps the figure it left with; a live one is estimated afresh.
  const estimated = row.status === "collected" ? num(row.estimated_volume_ml) : num(row.last_level) + num(row.added);
  const started = row.accumulation_started_at ? new Date(row.accumulation_started_at) : null;
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
    accumulationStartedAt: iso(row.accumulation_started_at),
    accumulation: acc ? { ...acc, limitAt: acc.limitAt.toISOString() } : null,
    fullAt: iso(row.full_at),
    collectedAt: iso(row.collected_at),
    pickupId: row.pickup_id,
    pickupReference: row.pickup_reference,
    instrument: row.instrument_id ? { id: row.instrument_id, name: row.instrument_name ?? "" } : null,
    lastReading: row.last_read_at ? { at: new Date(row.last_read_at).toISOString(), level_mL: num(row.last_level) } : null,
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
  const rows = await db().query<ContainerRow>(`${CONTAINER_SELECT} ${options.includeCollected ? "" : "WHERE c.status <> 'collected'"}`, {
    type: QueryTypes.SELECT,
    replacements: { at: now },
    transaction: options.transaction,
  });
  return rows
    .map((r) => containerView(r, settings, now))
    .sort((a, b) => STATUS_ORDER[a.status] - STATUS_ORDER[b.status] || b.fill.percent - a.fill.percent || a.code.localeCompare(b.code));
}

export async function getContainer(id: number, options: { now?: Date; transaction?: Transaction } = {}): Promise<ContainerView> {
  const now = options.now ?? new Date();
  const settings = await readWasteSettings(options.transaction);
  const [row] = await db().query<ContainerRow>(`${CONTAINER_SELECT} WHERE c.id = :id`, {
    type: QueryTypes.SELECT,
    replacements: { at: now, id },
    transaction: options.transaction,
  });
  if (!row) throw new HttpError(404, `No waste container with id ${id}.`);
  return containerView(row, settings, now);
}

/** The live estimate of one container at an instant (used to record a reading's difference). */
export async function estimateAt(id: number, at: Date, transaction?: Transaction): Promise<number> {
  const [row] = await db().query<ContainerRow>(`${CONTAINER_SELECT} WHERE c.id = :id`, {
    type: QueryTypes.SELECT,
    replacements: { at, id },
    transaction,
  });
  if (!row) throw new HttpError(404, `No waste container with id ${id}.`);
  return num(row.last_level) + num(row.added);
}

export interface ContainerHistory {
  readings: {
    id: number;
    at: string;
    level_mL: number;
    estimatedBefore_mL: number;
    difference_mL: number;
    reader: string | null;
    note: string | null;
  }[];
  events: { at: string; action: string; actor: string | null; detail: unknown }[];
  /** What went in during the current accumulation, per reagent. */
  contents: { reagentId: string; volume_mL: number }[];
}

export async function containerHistory(id: number): Promise<ContainerHistory> {
  const readings = await db().query<{
    id: number;
    read_at: Date;
    level_ml: string;
    estimated_before_ml: string;
    reader: string | null;
    note: string | null;
  }>(
    `SELECT r.id, r.read_at, r.level_ml, r.estimated_before_ml, u.name AS reader, r.note
       FROM waste_readings r LEFT JOIN users u ON u.id = r.reader_id WHERE r.container_id = :id ORDER BY r.read_at DESC, r.id DESC`,
    { type: QueryTypes.SELECT, replacements: { id } },
  );
  const events = await db().query<{ created_at: Date; action: string; actor: string | null; after: unknown }>(
    `SELECT a.created_at, a.action, u.name AS actor, a.after FROM audit_log a LEFT JOIN users u ON u.id = a.actor_id
      WHERE a.entity = 'waste_container' AND a.entity_id = :id ORDER BY a.created_at DESC, a.id DESC LIMIT 50`,
    { type: QueryTypes.SELECT, replacements: { id: String(id) } },
  );
  const contents = await db().query<{ reagent_id: string; v: string }>(
    `SELECT l.reagent_id, SUM(l.volume_ml) AS v FROM ledger_entries l JOIN waste_containers c ON c.id = l.waste_container_id
      WHERE c.id = :id AND (c.accumulation_started_at IS NULL OR l.occurred_at >= c.accumulation_started_at)
      GROUP BY l.reagent_id HAVING SUM(l.volume_ml) > 0 ORDER BY v DESC`,
    { type: QueryTypes.SELECT, replacements: { id } },
  );
  return {
    readings: readings.map((r) => ({
      id: r.id,
      at: new Date(r.read_at).toISOString(),
      level_mL: num(r.level_ml),
      estimatedBefore_mL: num(r.estimated_before_ml),
      difference_mL: Math.round((num(r.level_ml) - num(r.estimated_before_ml)) * 10) / 10,
      reader: r.reader,
      note: r.note,
    })),
    events: events.map((e) => ({
      at: new Date(e.created_at).toISOString(),
      action: e.action,
      actor: e.actor,
      detail: typeof e.after === "string" ? safeJson(e.after) : e.after,
    })),
    contents: contents.map((c) => ({ reagentId: c.reagent_id, volume_mL: Math.round(num(c.v) * 10) / 10 })),
  };
}

const safeJson = (s: string) => {
  try {
    return JSON.parse(s);
  } catch {
    return s;
  }
};

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
    const [instrument] = await db().query<{ id: number }>("SELECT id FROM instruments WHERE id = :instrumentId", {
      type: QueryTypes.SELECT,
      replacements: { instrumentId },
      transaction,
    });
    if (!instrument) throw new HttpError(400, `instrumentId: no instrument with id ${instrumentId}`);
  }
  // An instrument drains to one container at a time, and here a container serves one instrument.
  await db().query(
    "UPDATE instruments SET waste_container_id = NULL WHERE waste_container_id = :containerId AND (:instrumentId IS NULL OR id <> :instrumentId)",
    { replacements: { containerId, instrumentId }, transaction },
  );
  if (instrumentId !== null)
    await db().query("UPDATE instruments SET waste_container_id = :containerId WHERE id = :instrumentId", {
      replacements: { containerId, instrumentId },
      transaction,
    });
}

async function servedInstrument(containerId: number, transaction?: Transaction): Promise<number | null> {
  const [row] = await db().query<{ id: number }>("SELECT MIN(id) AS id FROM instruments WHERE waste_container_id = :containerId", {
    type: QueryTypes.SELECT,
    replacements: { containerId },
    transaction,
  });
  return row?.id ?? null;
}

async function requireStream(streamId: string, transaction: Transaction) {
  if (!(await WasteStream.findByPk(streamId, { transaction }))) throw new HttpError(400, `streamId: no stream "${streamId}"`);
}

export async function createContainer(input: ContainerInput, ctx: Context): Promise<ContainerView> {
  const id = await inTransaction(db(), async (transaction) => {
    await requireStream(input.streamId, transaction);
    if (await WasteContainer.findOne({ where: { code: input.code }, transaction }))
      throw new HttpError(409, `code: a container ${input.code} exists already`);
    const container = await WasteContainer.create(
      {
        code: input.code,
        streamId: input.streamId,
        capacityMl: input.capacity_mL,
        room: input.room,
        locationKind: input.locationKind,
        locationNote: input.locationNote,
        status: "in_use",
        accumulationStartedAt: new Date(),
        fullAt: null,
        collectedAt: null,
        pickupId: null,
      },
      { transaction },
    );
    await linkInstrument(container.id, input.instrumentId, transaction);
    await recordAudit(
      {
        actorId: ctx.actor.id,
        action: "waste.container.create",
        entity: "waste_container",
        entityId: container.id,
        ip: ctx.ip ?? null,
        after: containerSnapshot(container, input.instrumentId),
      },
      transaction,
    );
    return container.id;
  });
  return getContainer(id);
}

export async function updateContainer(id: number, input: ContainerInput, ctx: Context): Promise<ContainerView> {
  await inTransaction(db(), async (transaction) => {
    const container = await WasteContainer.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!container) throw new HttpError(404, `No waste container with id ${id}.`);
    if (container.status === "collected") throw new HttpError(409, `${container.code} was collected; it stays in the history as it was.`);
    await requireStream(input.streamId, transaction);
    if (input.code !== container.code && (await WasteContainer.findOne({ where: { code: input.code }, transaction })))
      throw new HttpError(409, `code: a container ${input.code} exists already`);
    if (input.streamId !== container.streamId && num(await estimateAt(id, new Date(), transaction)) > 0) {
      throw new HttpError(409, `streamId: ${container.code} already holds waste of its stream; start a new container for another stream.`);
    }
    const before = containerSnapshot(container, await servedInstrument(id, transaction));
    await container.update(
      {
        code: input.code,
        streamId: input.streamId,
        capacityMl: input.capacity_mL,
        room: input.room,
        locationKind: input.locationKind,
        locationNote: input.locationNote,
      },
      { transaction },
    );
    await linkInstrument(id, input.instrumentId, transaction);
    await recordAudit(
      {
        actorId: ctx.actor.id,
        action: "waste.container.update",
        entity: "waste_container",
        entityId: id,
        ip: ctx.ip ?? null,
        before,
        after: containerSnapshot(container, input.instrumentId),
      },
      transaction,
    );
  });
  return getContainer(id);
}

/** Records a level reading; the difference from Decant's estimate is stored with it. */
export async function recordReading(
  id: number,
  input: ReadingInput,
  ctx: Context,
): Promise<{ container: ContainerView; estimatedBefore_mL: number; difference_mL: number }> {
  const readAt = input.readAt ? new Date(input.readAt) : new Date();
  if (readAt.getTime() > Date.now() + 5 * 60_000) throw new HttpError(400, "readAt: cannot be in the future");
  const result = await inTransaction(db(), async (transaction) => {
    const container = await WasteContainer.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!container) throw new HttpError(404, `No waste container with id ${id}.`);
    if (container.status === "collected") throw new HttpError(409, `${container.code} was collected; a reading no longer applies.`);
    if (container.accumulationStartedAt && readAt < container.accumulationStartedAt)
      throw new HttpError(400, "readAt: before this container started accumulating");
    if (input.level_mL > container.capacityMl * 1.2)
      throw new HttpError(400, `level_mL: more than the container's capacity (${container.capacityMl} mL) allows`);
    const before = await estimateAt(id, readAt, transaction);
    const reading = await WasteReading.create(
      { containerId: id, readAt, levelMl: input.level_mL, estimatedBeforeMl: before, readerId: ctx.actor.id, note: input.note },
      { transaction },
    );
    const difference = Math.round((input.level_mL - before) * 10_000) / 10_000;
    await container.update({ estimatedVolumeMl: await estimateAt(id, new Date(), transaction) }, { transaction });
    await recordAudit(
      {
        actorId: ctx.actor.id,
        action: "waste.reading",
        entity: "waste_container",
        entityId: id,
        ip: ctx.ip ?? null,
        before: { estimated_mL: before },
        after: { readingId: reading.id, level_mL: input.level_mL, difference_mL: difference, readAt: readAt.toISOString() },
      },
      transaction,
    );
    return { estimatedBefore_mL: Math.round(before * 10) / 10, difference_mL: Math.round(difference * 10) / 10 };
  });
  return { container: await getContainer(id), ...result };
}

/** Marks a container full (it then takes no more runs) or back in use. */
export async function setContainerStatus(id: number, status: "in_use" | "full", ctx: Context): Promise<ContainerView> {
  await inTransaction(db(), async (transaction) => {
    const container = await WasteContainer.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!container) throw new HttpError(404, `No waste container with id ${id}.`);
    if (container.status === "awaiting_pickup" || container.status === "collected") {
      throw new HttpError(409, `status: ${container.code} is ${container.status.replace("_", " ")}; its pickup sets its state.`);
    }
    if (container.status === status) return;
    const before = { status: container.status, fullAt: iso(container.fullAt) };
    await container.update({ status, fullAt: status === "full" ? new Date() : null }, { transaction });
    await recordAudit(
      {
        actorId: ctx.actor.id,
        action: "waste.container.status",
        entity: "waste_container",
        entityId: id,
        ip: ctx.ip ?? null,
        before,
        after: { status, fullAt: iso(container.fullAt) },
      },
      transaction,
    );
  });
  return getContainer(id);
}

export type ContainerAcceptance =
  | { ok: true; containerId: number; code: string; streamId: string }
  | { ok: false; containerId: number | null; code: "unknown-container" | "not-in-use" | "unknown-stream" | "wrong-stream"; reason: string };

/**
 * May a mix routed to `mixStream` go into this container? The run logger calls this before it
 * writes a run and refuses the run with `reason` when the answer is no. `container` is the
 * container's id (or an object carrying it, e.g. an instrument's current container).
 */
export async function checkContainerAccepts(
  container: number | { id: number },
  mixStream: string,
  options: { transaction?: Transaction } = {},
): Promise<ContainerAcceptance> {
  const id = typeof container === "number" ? container : container.id;
  const { transaction } = options;
  const row = await WasteContainer.findByPk(id, { transaction });
  if (!row) return { ok: false, containerId: null, code: "unknown-container", reason: `There is no waste container with id ${id}.` };
  const streams = await WasteStream.findAll({ transaction });
  const own = streams.find((s) => s.id === row.streamId);
  const mix = streams.find((s) => s.id === mixStream);
  if (!mix || !own) {
    return {
      ok: false,
      containerId: id,
      code: "unknown-stream",
      reason: `${row.code}: the mix's waste stream "${mixStream}" is not one of the site's streams; ask the safety officer where it goes.`,
    };
  }
  if (row.status !== "in_use") {
    const state = row.status === "full" ? "marked full" : row.status === "awaiting_pickup" ? "waiting for pickup" : "collected";
    return {
      ok: false,
      containerId: id,
      code: "not-in-use",
      reason: `${row.code} is ${state}; route the instrument to another ${own.name.toLowerCase()} container first.`,
    };
  }
  if (!streamAccepts(ruleOf(own), mixStream)) {
    return {
      ok: false,
      containerId: id,
      code: "wrong-stream",
      reason: `${row.code} is a ${own.name.toLowerCase()} container and does not take ${mix.name.toLowerCase()} waste; this mix must go to a ${mix.name.toLowerCase()} container. Follow your institution's hazardous-waste procedures.`,
    };
  }
  return { ok: true, containerId: id, code: row.code, streamId: row.streamId };
}

// ── Alerts ─────────────────────────────────────────────────────────────────────────────────

export interface AlertView {
  containerId: number;
  code: string;
  stream: string;
  room: string;
  kind: AlertKind;
  message: string;
}

export function alertMessage(c: ContainerView, kind: AlertKind, settings: WasteLimits): string {
  switch (kind) {
    case "near-full":
      return `${c.code} is at ${c.fill.percent} % of its capacity (threshold ${settings.fullThreshold_percent} %); request a pickup or swap the container.`;
    case "over-capacity":
      return `${c.code} is estimated above its capacity (${c.fill.percent} %); check the level and stop routing waste into it.`;
    case "accumulation-approaching":
      return `${c.code} has been accumulating for ${c.accumulation?.days ?? "?"} days; the site's limit (${settings.accumulationLimit_days} days) is reached in ${c.accumulation?.daysLeft ?? "?"} days.`;
    case "accumulation-over":
      return `${c.code} has been accumulating for ${c.accumulation?.days ?? "?"} days, past the site's limit of ${settings.accumulationLimit_days} days.`;
  }
}

/** Alerts as they stand now (computed live, for the pages). */
export async function currentAlerts(now = new Date()): Promise<AlertView[]> {
  const [containers, settings] = await Promise.all([listContainers({ now }), readWasteSettings()]);
  return containers.flatMap((c) =>
    c.alerts.map((kind) => ({
      containerId: c.id,
      code: c.code,
      stream: c.stream,
      room: c.room,
      kind,
      message: alertMessage(c, kind, settings),
    })),
  );
}

export interface AlertCheckResult {
  /** False when another app instance held the lock: this one did nothing. */
  ran: boolean;
  raised: number;
  mailed: number;
  recipients: string[];
}

type MailSender = (mail: { to: string; subject: string; text: string; html: string }) => Promise<void>;

/**
 * The scheduled check: raises each alert once per container accumulation (a unique key in
 * waste_alerts) and mails the new ones to the safety officers, under a database lock so that two
 * app instances never send the same mail.
 */
export async function runWasteAlertCheck(options: { now?: Date; send?: MailSender } = {}): Promise<AlertCheckResult> {
  const now = options.now ?? new Date();
  const { withJobLock } = await import("../job-lock");
  const outcome = await withJobLock("waste-alerts", 5 * 60_000, async () => {
    const [containers, settings] = await Promise.all([listContainers({ now }), readWasteSettings()]);
    let raised = 0;
    for (const c of containers) {
      for (const kind of c.alerts) {
        const [, affected] = await db().query(
          `INSERT IGNORE INTO waste_alerts (container_id, kind, cycle, detail, raised_at) VALUES (:id, :kind, :cycle, :detail, :now)`,
          {
            type: QueryTypes.INSERT,
            replacements: {
              id: c.id,
              kind,
              cycle: c.accumulationStartedAt ?? "none",
              detail: JSON.stringify({ message: alertMessage(c, kind, settings), fill_percent: c.fill.percent }),
              now,
            },
          },
        );
        raised += Number(affected) > 0 ? 1 : 0;
      }
      // Keep the cached column close to the live estimate.
      await db().query("UPDATE waste_containers SET estimated_volume_ml = :v WHERE id = :id AND status <> 'collected'", {
        replacements: { v: c.estimated_mL, id: c.id },
      });
    }
    const pending = await db().query<{ id: number; detail: unknown; code: string }>(
      `SELECT a.id, a.detail, c.code FROM waste_alerts a JOIN waste_containers c ON c.id = a.container_id WHERE a.mailed_at IS NULL ORDER BY c.code, a.id`,
      { type: QueryTypes.SELECT },
    );
    if (pending.length === 0) return { raised, mailed: 0, recipients: [] };
    const officers = await db().query<{ email: string }>("SELECT email FROM users WHERE role = 'safety' AND active = 1 ORDER BY id", {
      type: QueryTypes.SELECT,
    });
    if (officers.length === 0) return { raised, mailed: 0, recipients: [] };
    const lines = pending.map((p) => {
      const detail = (typeof p.detail === "string" ? safeJson(p.detail) : p.detail) as { message?: string } | null;
      return detail?.message ?? p.code;
    });
    const send = options.send ?? (await import("../mail")).sendMail;
    const { escapeHtml } = await import("../mail");
    const subject = `Decant waste alert: ${pending.length === 1 ? lines[0]!.split(" ")[0] : `${pending.length} containers need attention`}`;
    const caution =
      "Follow your institution's hazardous-waste procedures and local regulations; Decant's estimates support, and never replace, a look at the container.";
    const text = `The scheduled waste check found:\n\n${lines.map((l) => `- ${l}`).join("\n")}\n\n${caution}\n`;
    const html = `<p>The scheduled waste check found:</p><ul>${lines.map((l) => `<li>${escapeHtml(l)}</li>`).join("")}</ul><p>${escapeHtml(caution)}</p>`;
    for (const officer of officers) await send({ to: officer.email, subject, text, html });
    await db().query("UPDATE waste_alerts SET mailed_at = :now WHERE id IN (:ids)", {
      replacements: { now, ids: pending.map((p) => p.id) },
    });
    return { raised, mailed: pending.length, recipients: officers.map((o) => o.email) };
  });
  return outcome.ran ? { ran: true, ...outcome.result } : { ran: false, raised: 0, mailed: 0, recipients: [] };
}

let schedule: NodeJS.Timeout | undefined;

/** Starts the in-process schedule of the alert check (every 15 minutes, first run after one minute). */
export function ensureWasteAlertSchedule(every_ms = 15 * 60_000) {
  if (schedule || process.env.DECANT_NO_SCHEDULE === "1") return;
  const tick = () =>
    void runWasteAlertCheck().catch((error) => console.warn(`waste alert check failed: ${error instanceof Error ? error.message : error}`));
  const first = setTimeout(tick, 60_000);
  first.unref();
  schedule = setInterval(tick, every_ms);
  schedule.unref();
}

// ── Pickups ────────────────────────────────────────────────────────────────────────────────

export interface PickupView {
  id: number;
  reference: string | null;
  status: "requested" | "collected" | "cancelled";
  requestedAt: string;
  requestedBy: string | null;
  collectedAt: string | null;
  manifestRef: string | null;
  note: string | null;
  containers: { id: number; code: string; stream: string; estimated_mL: number }[];
}

export async function listPickups(): Promise<PickupView[]> {
  const pickups = await db().query<{
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
    { type: QueryTypes.SELECT },
  );
  const containers = await listContainers({ includeCollected: true });
  return pickups.map((p) => ({
    id: p.id,
    reference: p.reference,
    status: p.status,
    requestedAt: new Date(p.requested_at).toISOString(),
    requestedBy: p.requested_by,
    collectedAt: iso(p.collected_at),
    manifestRef: p.manifest_ref,
    note: p.note,
    containers: containers
      .filter((c) => c.pickupId === p.id)
      .map((c) => ({ id: c.id, code: c.code, stream: c.stream, estimated_mL: c.estimated_mL })),
  }));
}

async function nextPickupReference(now: Date, transaction: Transaction): Promise<string> {
  const year = now.getUTCFullYear();
  const [row] = await db().query<{ n: number }>("SELECT COUNT(*) AS n FROM pickups WHERE reference LIKE :prefix", {
    type: QueryTypes.SELECT,
    replacements: { prefix: `PU-${year}-%` },
    transaction,
  });
  return `PU-${year}-${String(num(row?.n) + 1).padStart(3, "0")}`;
}

/** Requests a pickup for containers that are full or in use: they wait for collection and take no more waste. */
export async function requestPickup(input: PickupRequest, ctx: Context): Promise<PickupView> {
  const now = new Date();
  const pickupId = await inTransaction(db(), async (transaction) => {
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
      await db().query("UPDATE instruments SET waste_container_id = NULL WHERE waste_container_id = :id", {
        replacements: { id: c.id },
        transaction,
      });
      await recordAudit(
        {
          actorId: ctx.actor.id,
          action: "waste.container.status",
          entity: "waste_container",
          entityId: c.id,
          ip: ctx.ip ?? null,
          before,
          after: { status: "awaiting_pickup", pickup: pickup.reference },
        },
        transaction,
      );
    }
    await recordAudit(
      {
        actorId: ctx.actor.id,
        action: "waste.pickup.request",
        entity: "pickup",
        entityId: pickup.id,
        ip: ctx.ip ?? null,
        after: { reference: pickup.reference, containers: containers.map((c) => c.code), note: input.note },
      },
      transaction,
    );
    return pickup.id;
  });
  return (await listPickups()).find((p) => p.id === pickupId)!;
}

/** Records the collection: the containers leave the live totals and stay in the history. */
export async function recordCollection(pickupId: number, input: CollectionInput, ctx: Context): Promise<PickupView> {
  const collectedAt = input.collectedAt ? new Date(input.collectedAt) : new Date();
  if (collectedAt.getTime() > Date.now() + 5 * 60_000) throw new HttpError(400, "collectedAt: cannot be in the future");
  await inTransaction(db(), async (transaction) => {
    const pickup = await Pickup.findByPk(pickupId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!pickup) throw new HttpError(404, `No pickup with id ${pickupId}.`);
    if (pickup.status !== "requested") throw new HttpError(409, `Pickup ${pickup.reference ?? pickup.id} is ${pickup.status} already.`);
    if (collectedAt < pickup.requestedAt) throw new HttpError(400, "collectedAt: before the pickup was requested");
    const containers = await WasteContainer.findAll({ where: { pickupId }, transaction, lock: transaction.LOCK.UPDATE });
    for (const c of containers) {
      const estimate = await estimateAt(c.id, collectedAt, transaction);
      await c.update({ status: "collected", collectedAt, estimatedVolumeMl: estimate }, { transaction });
      await recordAudit(
        {
          actorId: ctx.actor.id,
          action: "waste.container.status",
          entity: "waste_container",
          entityId: c.id,
          ip: ctx.ip ?? null,
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
    await recordAudit(
      {
        actorId: ctx.actor.id,
        action: "waste.pickup.collected",
        entity: "pickup",
        entityId: pickupId,
        ip: ctx.ip ?? null,
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
  return (await listPickups()).find((p) => p.id === pickupId)!;
}

// ── Totals ─────────────────────────────────────────────────────────────────────────────────

// What reaches waste: runs, discards and draws, and the corrections that reverse one of them.
const WASTE_ENTRIES = `
  FROM ledger_entries l
  LEFT JOIN ledger_entries rev ON rev.id = l.reverses_id
 WHERE l.occurred_at >= :start AND l.occurred_at < :end
   AND (l.kind IN ('run', 'discard', 'draw') OR (l.kind = 'correction' AND rev.kind IN ('run', 'discard', 'draw')))`;
const STREAM_OF = "COALESCE(l.waste_stream_id, rev.waste_stream_id, 'unassigned')";

export interface StreamTotal {
  stream: string;
  volume_mL: number;
}

const roundVolume = (v: unknown) => Math.round(num(v) * 10_000) / 10_000;

/** The fixed contract of `GET /api/waste/summary`: every site stream (0 when nothing went to it), by volume. */
export async function wasteSummary(period: Period): Promise<{ streams: StreamTotal[] }> {
  const { start, end } = periodBounds(period);
  const [rows, streams] = await Promise.all([
    db().query<{ stream: string; v: string }>(
      `SELECT ${STREAM_OF} AS stream, SUM(l.volume_ml) AS v ${WASTE_ENTRIES} GROUP BY ${STREAM_OF}`,
      { type: QueryTypes.SELECT, replacements: { start, end } },
    ),
    WasteStream.findAll({ attributes: ["id", "restrictiveness"], order: [["restrictiveness", "DESC"]] }),
  ]);
  const totals = new Map<string, number>(streams.map((s) => [s.id, 0]));
  for (const r of rows) totals.set(r.stream, roundVolume(r.v));
  return {
    streams: [...totals]
      .map(([stream, volume_mL]) => ({ stream, volume_mL }))
      .sort((a, b) => b.volume_mL - a.volume_mL || a.stream.localeCompare(b.stream)),
  };
}

export interface WasteReport {
  period: Period;
  streams: (StreamTotal & { name: string })[];
  byRoom: { room: string; streams: Record<string, number>; volume_mL: number }[];
  byProject: { projectCode: string; projectName: string; volume_mL: number; streams: Record<string, number> }[];
  byMonth: { month: string; streams: Record<string, number>; volume_mL: number }[];
  total_mL: number;
}

/** The safety officer's view of a period: by stream, room (of the container), project and month. */
export async function wasteReport(period: Period): Promise<WasteReport> {
  const { start, end } = periodBounds(period);
  const replacements = { start, end };
  const [summary, streams, rooms, projects, months] = await Promise.all([
    wasteSummary(period),
    WasteStream.findAll({ attributes: ["id", "name"] }),
    db().query<{ room: string; stream: string; v: string }>(
      `SELECT COALESCE(c.room, 'not recorded') AS room, ${STREAM_OF} AS stream, SUM(l.volume_ml) AS v ${WASTE_ENTRIES.replace("LEFT JOIN ledger_entries rev", "LEFT JOIN waste_containers c ON c.id = l.waste_container_id LEFT JOIN ledger_entries rev")}
       GROUP BY COALESCE(c.room, 'not recorded'), ${STREAM_OF}`,
      { type: QueryTypes.SELECT, replacements },
    ),
    db().query<{ code: string | null; name: string | null; stream: string; v: string }>(
      `SELECT p.code, p.name, ${STREAM_OF} AS stream, SUM(l.volume_ml) AS v ${WASTE_ENTRIES.replace("LEFT JOIN ledger_entries rev", "LEFT JOIN projects p ON p.id = l.project_id LEFT JOIN ledger_entries rev")}
       GROUP BY p.code, p.name, ${STREAM_OF}`,
      { type: QueryTypes.SELECT, replacements },
    ),
    db().query<{ month: string; stream: string; v: string }>(
      `SELECT DATE_FORMAT(l.occurred_at, '%Y-%m') AS month, ${STREAM_OF} AS stream, SUM(l.volume_ml) AS v ${WASTE_ENTRIES}
       GROUP BY DATE_FORMAT(l.occurred_at, '%Y-%m'), ${STREAM_OF}`,
      { type: QueryTypes.SELECT, replacements },
    ),
  ]);
  const nameOf = (id: string) => streams.find((s) => s.id === id)?.name ?? (id === "unassigned" ? "No stream recorded" : id);
  const group = <K extends string>(rows: { stream: string; v: string }[], key: (r: never) => K) => {
    const out = new Map<K, Record<string, number>>();
    for (const r of rows) {
      const k = key(r as never);
      const rec = out.get(k) ?? {};
      rec[r.stream] = roundVolume((rec[r.stream] ?? 0) + num(r.v));
      out.set(k, rec);
    }
    return out;
  };
  const sum = (rec: Record<string, number>) => roundVolume(Object.values(rec).reduce((a, b) => a + b, 0));
  const roomGroups = group(rooms, (r: { room: string }) => r.room);
  const projectGroups = group(projects, (r: { code: string | null }) => r.code ?? "—");
  const projectNames = new Map(projects.map((p) => [p.code ?? "—", p.name ?? "No project"]));
  const monthGroups = group(months, (r: { month: string }) => r.month);
  return {
    period,
    streams: summary.streams.map((s) => ({ ...s, name: nameOf(s.stream) })),
    byRoom: [...roomGroups]
      .map(([room, rec]) => ({ room, streams: rec, volume_mL: sum(rec) }))
      .sort((a, b) => a.room.localeCompare(b.room)),
    byProject: [...projectGroups]
      .map(([code, rec]) => ({ projectCode: code, projectName: projectNames.get(code) ?? "", streams: rec, volume_mL: sum(rec) }))
      .sort((a, b) => b.volume_mL - a.volume_mL),
    byMonth: monthsIn(period).map((month) => {
      const rec = monthGroups.get(month) ?? {};
      return { month, streams: rec, volume_mL: sum(rec) };
    }),
    total_mL: roundVolume(summary.streams.reduce((a, s) => a + s.volume_mL, 0)),
  };
}

/** Waste on hand now: live containers (collected ones have left), by stream and by room. */
export async function wasteOnHand(
  now = new Date(),
): Promise<{ byStream: Record<string, number>; byRoom: Record<string, number>; total_mL: number }> {
  const containers = await listContainers({ now });
  const byStream: Record<string, number> = {};
  const byRoom: Record<string, number> = {};
  for (const c of containers) {
    byStream[c.streamId] = (byStream[c.streamId] ?? 0) + c.estimated_mL;
    byRoom[c.room] = (byRoom[c.room] ?? 0) + c.estimated_mL;
  }
  return { byStream, byRoom, total_mL: containers.reduce((a, c) => a + c.estimated_mL, 0) };
}

// ── Flammables ─────────────────────────────────────────────────────────────────────────────

export interface FlammablesInRoom {
  room: string;
  /** Flammable reagents in stock lots (what is left in the bottles). */
  stock_L: number;
  /** The flammable share of what is left of the live batches (ready or in use) kept in the room. */
  batches_L: number;
  /** The flammable share of the live waste containers in the room. */
  waste_L: number;
  onHand_L: number;
  limit_L: number | null;
  /** "over" at or above the limit, "near" from 80 % of it. */
  state: "ok" | "near" | "over" | "no-limit";
}

/**
 * The flammable share of a batch (v/v): its flammable liquid components (the catalogue's flag;
 * the reagents table's for a reagent the catalogue lacks) over all its liquid components.
 */
export function flammableShare(
  components: readonly { reagentId: string; unit: string; amount_mL: number; tableFlammable?: boolean }[],
): number {
  const liquids = components.filter((c) => c.unit === "mL");
  const total = liquids.reduce((sum, c) => sum + Math.max(0, c.amount_mL), 0);
  if (!(total > 0)) return 0;
  const flammable = liquids
    .filter((c) => getReagent(c.reagentId)?.flammable ?? c.tableFlammable ?? false)
    .reduce((sum, c) => sum + Math.max(0, c.amount_mL), 0);
  return Math.min(1, flammable / total);
}

/** Flammable liquids on hand per room (stock lots, live batches and waste), against the room limit the safety officer sets. */
export async function flammablesByRoom(now = new Date()): Promise<FlammablesInRoom[]> {
  const [stock, batchParts, shares, containers, settings] = await Promise.all([
    db().query<{ room: string; remaining: string }>(
      `SELECT COALESCE(l.room, 'unassigned') AS room, SUM(l.remaining) AS remaining
         FROM stock_lots l JOIN reagents r ON r.id = l.reagent_id
        WHERE r.flammable = 1 AND r.unit = 'mL' AND l.remaining > 0
        GROUP BY COALESCE(l.room, 'unassigned')`,
      { type: QueryTypes.SELECT },
    ),
    // Each live batch's components: what is left of it × its flammable share is on the bench.
    db().query<{
      id: number;
      room: string;
      remaining_ml: string;
      reagent_id: string | null;
      unit: string | null;
      amount: string | null;
      table_flammable: number | null;
    }>(
      `SELECT b.id, COALESCE(b.room, 'unassigned') AS room, b.remaining_ml, c.reagent_id, c.unit,
              COALESCE(c.actual_amount, c.target_amount) AS amount, r.flammable AS table_flammable
         FROM batches b
         LEFT JOIN batch_components c ON c.batch_id = b.id
         LEFT JOIN reagents r ON r.id = c.reagent_id
        WHERE b.status IN ('ready', 'in_use') AND b.remaining_ml > 0`,
      { type: QueryTypes.SELECT },
    ),
    // The flammable fraction of what went into each live container during its accumulation.
    db().query<{ id: number; flammable: string | null; total: string | null }>(
      `SELECT c.id, SUM(CASE WHEN r.flammable = 1 THEN l.volume_ml ELSE 0 END) AS flammable, SUM(l.volume_ml) AS total
         FROM waste_containers c
         JOIN ledger_entries l ON l.waste_container_id = c.id AND (c.accumulation_started_at IS NULL OR l.occurred_at >= c.accumulation_started_at)
         JOIN reagents r ON r.id = l.reagent_id
        WHERE c.status <> 'collected'
        GROUP BY c.id`,
      { type: QueryTypes.SELECT },
    ),
    listContainers({ now }),
    readWasteSettings(),
  ]);
  const rooms = new Map<string, { stock: number; batches: number; waste: number }>();
  const at = (room: string) => rooms.get(room) ?? rooms.set(room, { stock: 0, batches: 0, waste: 0 }).get(room)!;
  for (const s of stock) at(s.room).stock += num(s.remaining) / 1000;
  const batches = new Map<
    number,
    { room: string; remaining: number; parts: { reagentId: string; unit: string; amount_mL: number; tableFlammable: boolean }[] }
  >();
  for (const p of batchParts) {
    const b = batches.get(p.id) ?? batches.set(p.id, { room: p.room, remaining: num(p.remaining_ml), parts: [] }).get(p.id)!;
    if (p.reagent_id && p.unit)
      b.parts.push({ reagentId: p.reagent_id, unit: p.unit, amount_mL: num(p.amount), tableFlammable: num(p.table_flammable) === 1 });
  }
  for (const b of batches.values()) {
    const share = flammableShare(b.parts);
    if (share > 0) at(b.room).batches += (b.remaining * share) / 1000;
  }
  for (const c of containers) {
    const share = shares.find((s) => s.id === c.id);
    const fraction = share && num(share.total) > 0 ? Math.min(1, Math.max(0, num(share.flammable) / num(share.total))) : 0;
    if (fraction > 0) at(c.room).waste += (c.estimated_mL * fraction) / 1000;
  }
  for (const room of Object.keys(settings.roomLimits_L)) at(room);
  return [...rooms]
    .map(([room, v]) => {
      const onHand = v.stock + v.batches + v.waste;
      const limit = settings.roomLimits_L[room] ?? null;
      const state: FlammablesInRoom["state"] =
        limit === null ? "no-limit" : onHand >= limit ? "over" : onHand >= 0.8 * limit ? "near" : "ok";
      const r2 = (x: number) => Math.round(x * 100) / 100;
      return { room, stock_L: r2(v.stock), batches_L: r2(v.batches), waste_L: r2(v.waste), onHand_L: r2(onHand), limit_L: limit, state };
    })
    .sort((a, b) => a.room.localeCompare(b.room));
}

// ── Instruments (for the container form) ───────────────────────────────────────────────────

export async function instrumentChoices(): Promise<
  { id: number; name: string; room: string; containerId: number | null; containerCode: string | null }[]
> {
  const rows = await db().query<{ id: number; name: string; room: string; waste_container_id: number | null; code: string | null }>(
    "SELECT i.id, i.name, i.room, i.waste_container_id, c.code FROM instruments i LEFT JOIN waste_containers c ON c.id = i.waste_container_id WHERE i.active = 1 ORDER BY i.name",
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ id: r.id, name: r.name, room: r.room, containerId: r.waste_container_id, containerCode: r.code }));
}

/** Which container to suggest for a stream in a room: an in-use one with the most room left. */
export function suggestContainer(containers: readonly ContainerView[], streamId: string, room: string): ContainerView | null {
  return (
    containers
      .filter((c) => c.status === "in_use" && c.streamId === streamId && c.room === room)
      .sort((a, b) => a.fill.percent - b.fill.percent)[0] ?? null
  );
}

// ── Report and label ───────────────────────────────────────────────────────────────────────

async function facilityName(): Promise<string> {
  const row = await Setting.findByPk("facility.name");
  return typeof row?.value === "string" ? row.value : "Decant facility";
}

/** Everything the CSV and PDF report of a period show. */
export async function wasteReportData(period: Period, now = new Date()): Promise<ReportData> {
  const [report, containers, flammables, facility] = await Promise.all([
    wasteReport(period),
    listContainers({ now }),
    flammablesByRoom(now),
    facilityName(),
  ]);
  return {
    facility,
    generatedAt: now.toISOString(),
    period,
    total_mL: report.total_mL,
    streams: report.streams,
    byRoom: report.byRoom,
    byProject: report.byProject,
    byMonth: report.byMonth,
    containers: containers.map((c) => ({
      code: c.code,
      stream: c.stream,
      room: c.room,
      status: c.status,
      estimated_mL: c.estimated_mL,
      capacity_mL: c.capacity_mL,
      fill_percent: c.fill.percent,
      since: c.accumulationStartedAt?.slice(0, 10) ?? null,
    })),
    flammables: flammables.map((f) => ({ room: f.room, onHand_L: f.onHand_L, limit_L: f.limit_L, state: f.state })),
  };
}

/** What the container label prints. */
export async function containerLabelContent(id: number): Promise<ContainerLabelContent> {
  const [container, history, facility] = await Promise.all([getContainer(id), containerHistory(id), facilityName()]);
  const hazards = containerHazards(container.streamId, history.contents);
  return {
    code: container.code,
    streamName: container.stream,
    capacity_mL: container.capacity_mL,
    room: container.room,
    where: container.locationNote,
    accumulationStartedOn: container.accumulationStartedAt?.slice(0, 10) ?? null,
    pictograms: hazards.pictograms,
    signalWord: hazards.signalWord,
    contents: history.contents.slice(0, 5).map((c) => getReagent(c.reagentId)?.name ?? c.reagentId),
    facility,
  };
}

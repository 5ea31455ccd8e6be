/**
 * Recording a batch and following its bottles. The server recomputes every target from the
 * recipe version with the same pure plan the form used, checks the lots (an expired lot is
 * refused), flags deviations against the facility's tolerances, sets the expiry from the rule
 * table and the lots, and writes batch, components, bottles, stock debits, ledger entries and the
 * audit line in one transaction. The form's idempotency key makes a double click harmless.
 */
import { QueryTypes, UniqueConstraintError, type Transaction } from "sequelize";
import { ChemInputError, getReagent } from "../../chem";
import { hazardSummary } from "../../labels/hazards";
import type { LabelContent } from "../../labels/layout";
import { batchCodeBase, nextBatchCode } from "../../preparation/batch-code";
import { findDeviations, type Deviation } from "../../preparation/deviations";
import { batchExpiry, lotExpired } from "../../preparation/expiry";
import { assayUsed, lotChemistry, type AssayUsed } from "../../preparation/lot-assays";
import { componentShares, describeSpec, preparationPlan, type PlannedComponent } from "../../preparation/plan";
import { recipeSpecSchema, type RecipeSpec } from "../../schemas/recipes";
import type { BatchCreateInput } from "../../schemas/preparation";
import { recordAudit } from "../audit";
import { getSequelize } from "../db";
import type { SignedInUser } from "../guard";
import { HttpError } from "../http";
import { appendEntries, ensureCatalogueRows, wasteStreamOf, type NewLedgerEntry } from "./ledger";
import { getPreparationSettings } from "./preparation-settings";
import { getRecipeVersion } from "./recipes";
import { inTransaction, lastInsertId } from "./sql";
import { getStockLots } from "./stock-lots";

export type BottleStatus = "ready" | "in_use" | "empty" | "discarded";

export interface BatchComponentDetail {
  reagent: string;
  name: string;
  role: string;
  unit: "mL" | "g";
  target: number;
  actual: number | null;
  stockLotId: number | null;
  lotNumber: string | null;
  /** The assay the target was computed with (null for solvents and batches recorded before assays were kept). */
  assay: AssayUsed | null;
}

export interface BatchDetail {
  id: number;
  code: string;
  recipeId: number;
  recipeCode: string;
  recipeName: string;
  recipeVersion: number;
  recipeVersionId: number;
  channel: string | null;
  spec: RecipeSpec | null;
  composition: string;
  storage: string | null;
  detection_nm: number | null;
  volume_mL: number;
  remaining_mL: number;
  bottles: number;
  bottleSize_mL: number;
  temperature_C: number;
  measuredPH: number | null;
  phMeterTemperature_C: number | null;
  targetPH: number | null;
  preparedAt: string;
  expiresAt: string;
  expiryReason: string | null;
  preparedBy: string;
  status: BottleStatus;
  /** The room the batch is kept in; null for batches recorded before rooms were asked for. */
  room: string | null;
  expired: boolean;
  deviations: Deviation[];
  deviationReason: string | null;
  components: BatchComponentDetail[];
  bottleList: { number: number; status: BottleStatus; discarded_mL: number | null }[];
}

export interface RecordedBatch {
  created: boolean;
  batch: BatchDetail;
}

const sql = () => getSequelize();

function parseSpec(raw: unknown): RecipeSpec | null {
  try {
    const value = typeof raw === "string" ? JSON.parse(raw) : raw;
    const candidate = value && typeof value === "object" && "spec" in value ? (value as { spec: unknown }).spec : value;
    return recipeSpecSchema.parse(candidate);
  } catch {
    return null;
  }
}

async function existingByKey(key: string): Promise<number | null> {
  const [row] = await sql().query<{ id: number }>("SELECT id FROM batches WHERE idempotency_key = ?", {
    type: QueryTypes.SELECT,
    replacements: [key],
  });
  return row?.id ?? null;
}

/** Pairs each planned component with the form's line for the same reagent (in order, for repeats). */
function pairComponents(planned: readonly PlannedComponent[], given: BatchCreateInput["components"]) {
  const used = new Set<number>();
  return planned.map((p, i) => {
    const index = given.findIndex((g, j) => !used.has(j) && g.reagent === p.reagent);
    if (index < 0)
      throw new HttpError(400, `components.${i}.stockLotId: pick the lot of ${p.name} used`, {
        fields: { [`components.${i}.stockLotId`]: `Pick the lot of ${p.name} used` },
      });
    used.add(index);
    return { planned: p, given: given[index]!, index };
  });
}

/**
 * The rooms Decant knows, sorted: those of the instruments, the stock lots and the flammables
 * room limits. The preparation form offers them for "Kept in room"; the first is the default.
 */
export async function knownRooms(): Promise<string[]> {
  const rows = await sql().query<{ room: string | null }>(
    `SELECT room FROM instruments WHERE active = 1 UNION SELECT room FROM stock_lots UNION SELECT room FROM batches`,
    { type: QueryTypes.SELECT },
  );
  const [limits] = await sql().query<{ value: unknown }>("SELECT value FROM settings WHERE `key` = 'flammables.roomLimit_L'", {
    type: QueryTypes.SELECT,
  });
  let limitRooms: string[] = [];
  try {
    const value = typeof limits?.value === "string" ? JSON.parse(limits.value) : limits?.value;
    if (value && typeof value === "object" && !Array.isArray(value)) limitRooms = Object.keys(value);
  } catch {
    limitRooms = [];
  }
  const rooms = new Set(
    [...rows.map((r) => r.room), ...limitRooms].filter((r): r is string => typeof r === "string" && r.trim() !== "").map((r) => r.trim()),
  );
  return [...rooms].sort((a, b) => a.localeCompare(b));
}

export async function recordBatch(
  input: BatchCreateInput,
  actor: SignedInUser,
  ip: string | null = null,
  now = new Date(),
): Promise<RecordedBatch> {
  const again = await existingByKey(input.idempotencyKey);
  if (again !== null) return { created: false, batch: await getBatch(again, now) };

  const version = await getRecipeVersion(input.recipeVersionId);
  if (version.retired) throw new HttpError(409, `recipeVersionId: ${version.code} is retired`);
  if (!version.approved)
    throw new HttpError(409, `recipeVersionId: ${version.code} v${version.version} is not approved yet; a manager approves it first`);

  // The lots come first: their assays set the amounts to weigh.
  const lots = await getStockLots(
    input.components.map((c) => c.stockLotId),
    now,
  );
  const picked = input.components.map((c) => {
    const lot = lots.get(c.stockLotId);
    return lot && lot.reagent === c.reagent ? lot : undefined;
  });
  picked.forEach((lot, i) => {
    const other = picked.findIndex(
      (l) => l !== undefined && lot !== undefined && l.reagent === lot.reagent && l.assayPercent !== lot.assayPercent,
    );
    if (lot && other >= 0 && other < i) {
      const message = `Use one lot of ${lot.reagentName} for the batch, or lots with the same assay: its assay sets the amounts`;
      throw new HttpError(400, `components.${i}.stockLotId: ${message}`, { fields: { [`components.${i}.stockLotId`]: message } });
    }
  });
  let plan;
  try {
    plan = preparationPlan({
      spec: version.spec,
      volume_mL: input.volume_mL,
      temperature_C: input.temperature_C,
      detection_nm: version.detection_nm,
      ...lotChemistry(picked),
    });
  } catch (error) {
    if (error instanceof ChemInputError) throw new HttpError(400, `${error.field ?? "recipe"}: ${error.message}`);
    throw error;
  }
  const pairs = pairComponents(plan.components, input.components);
  for (const { planned, given, index } of pairs) {
    const field = `components.${index}.stockLotId`;
    const lot = lots.get(given.stockLotId);
    if (!lot) throw new HttpError(400, `${field}: no stock lot ${given.stockLotId}`, { fields: { [field]: "No such lot" } });
    if (lot.reagent !== planned.reagent)
      throw new HttpError(400, `${field}: lot ${lot.lotNumber} is ${lot.reagentName}, not ${planned.name}`, {
        fields: { [field]: `Lot ${lot.lotNumber} is ${lot.reagentName}` },
      });
    if (lotExpired(lot.expiresOn, now)) {
      const message = `lot ${lot.lotNumber} of ${lot.reagentName} expired on ${lot.expiresOn} and cannot be used; pick a lot in date`;
      throw new HttpError(400, `${field}: ${message}`, { fields: { [field]: message } });
    }
  }

  if (version.spec.buffer && (input.measuredPH === undefined || input.measuredPH === null)) {
    throw new HttpError(400, "measuredPH: record the pH measured on the aqueous part", {
      fields: { measuredPH: "Record the measured pH" },
    });
  }

  const settings = await getPreparationSettings();
  const deviations = findDeviations({
    tolerances: settings.tolerances,
    targetPH: version.spec.buffer?.targetPH ?? null,
    measuredPH: input.measuredPH ?? null,
    components: pairs.map(({ planned, given }) => ({
      name: planned.name,
      unit: planned.unit,
      target: planned.target,
      actual: given.actualAmount ?? null,
    })),
  });
  const reason = input.deviationReason?.trim() ?? "";
  const rooms = await knownRooms();
  if (input.room !== undefined && !rooms.includes(input.room)) {
    const message = `No room "${input.room}" is known; pick one of ${rooms.join(", ") || "the rooms of the instruments and stock lots"}`;
    throw new HttpError(400, `room: ${message}`, { fields: { room: message } });
  }
  const room = input.room ?? rooms[0] ?? null;
  if (deviations.length > 0 && reason.length < 5) {
    throw new HttpError(
      400,
      `deviationReason: outside tolerance (${deviations.map((d) => d.message).join("; ")}); give a reason to record the batch anyway`,
      {
        fields: { deviationReason: "Give a reason for the deviation" },
        deviations,
      },
    );
  }

  const expiry = batchExpiry({
    kind: plan.kind,
    preparedAt: now,
    rules: settings.expiryRules,
    lots: pairs.map((p) => lots.get(p.given.stockLotId)!).map((l) => ({ lotNumber: l.lotNumber, expiresOn: l.expiresOn })),
  });

  const snapshot = {
    recipeId: version.recipeId,
    recipeVersionId: version.versionId,
    code: version.code,
    name: version.name,
    version: version.version,
    spec: version.spec,
    detection_nm: version.detection_nm,
    storage: version.storage,
    kind: plan.kind,
  };
  // Claim the idempotency key first: a second submit (a double click) waits for the first one's
  // batch instead of racing it. The claim lives in MariaDB, so it holds across app instances.
  let claimed = true;
  try {
    await sql().query("INSERT INTO idempotency_keys (`key`, scope, created_at) VALUES (?, 'batch', NOW(3))", {
      replacements: [input.idempotencyKey],
    });
  } catch (error) {
    if (!(error instanceof UniqueConstraintError)) throw error;
    claimed = false;
  }
  if (!claimed) {
    for (let wait = 0; wait < 100; wait++) {
      const id = await existingByKey(input.idempotencyKey);
      if (id !== null) return { created: false, batch: await getBatch(id, now) };
      await new Promise((resolve) => setTimeout(resolve, 100));
    }
    throw new HttpError(409, "idempotencyKey: this form is being recorded already; reload the batch list in a moment");
  }
  let batchId = 0;
  try {
    // Two batches recorded at the same moment can deadlock on the day's code range; inTransaction tries again.
    await inTransaction(sql(), async (transaction) => {
      batchId = await insertBatch({ ...input, room: room ?? undefined }, snapshot, expiry, deviations, reason, actor, now, transaction);
      await ensureCatalogueRows(
        pairs.map((p) => p.planned.reagent),
        transaction,
      );
      const ledger: NewLedgerEntry[] = [];
      for (const { planned, given } of pairs) {
        const actual = given.actualAmount ?? planned.target;
        const assay = assayUsed(planned.reagent, planned.role, lots.get(given.stockLotId));
        await sql().query(
          "INSERT INTO batch_components (batch_id, reagent_id, stock_lot_id, role, unit, target_amount, actual_amount, assay_percent, assay_source) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)",
          {
            replacements: [
              batchId,
              planned.reagent,
              given.stockLotId,
              planned.role,
              planned.unit,
              planned.target.toFixed(5),
              given.actualAmount == null ? null : given.actualAmount.toFixed(5),
              assay ? assay.percent.toFixed(3) : null,
              assay?.source ?? null,
            ],
            transaction,
          },
        );
        await sql().query(
          "UPDATE stock_lots SET remaining = GREATEST(0, remaining - ?), opened_on = COALESCE(opened_on, ?), updated_at = NOW(3) WHERE id = ?",
          {
            replacements: [actual.toFixed(3), now.toISOString().slice(0, 10), given.stockLotId],
            transaction,
          },
        );
        ledger.push({
          occurredAt: now,
          projectId: null,
          kind: "preparation",
          batchId,
          reagentId: planned.reagent,
          volume_mL: planned.unit === "mL" ? actual : 0,
          mass_g: planned.unit === "g" ? actual : null,
          channel: null,
          wasteStreamId: null,
          wasteContainerId: null,
          sourceKind: "manual",
          sourceId: `batch:${batchId}`,
          authorId: actor.id,
        });
      }
      await appendEntries(ledger, transaction);
      for (let n = 1; n <= input.bottles; n++) {
        await sql().query(
          "INSERT INTO batch_bottles (batch_id, number, status, updated_by, created_at, updated_at) VALUES (?, ?, 'ready', ?, NOW(3), NOW(3))",
          { replacements: [batchId, n, actor.id], transaction },
        );
      }
      await recordAudit(
        {
          actorId: actor.id,
          action: "record",
          entity: "batch",
          entityId: batchId,
          ip,
          after: { ...input, room, expiresAt: expiry.expiresAt.toISOString(), deviations },
        },
        transaction,
      );
    });
  } catch (error) {
    await sql().query("DELETE FROM idempotency_keys WHERE `key` = ? AND scope = 'batch'", { replacements: [input.idempotencyKey] });
    throw error;
  }
  return { created: true, batch: await getBatch(batchId, now) };
}

async function insertBatch(
  input: BatchCreateInput,
  snapshot: object,
  expiry: { expiresAt: Date; reason: string },
  deviations: Deviation[],
  reason: string,
  actor: SignedInUser,
  now: Date,
  transaction: Transaction,
): Promise<number> {
  const base = batchCodeBase(now);
  for (let attempt = 0; attempt < 5; attempt++) {
    const taken = (
      await sql().query<{ code: string }>("SELECT code FROM batches WHERE code = ? OR code LIKE ? FOR UPDATE", {
        type: QueryTypes.SELECT,
        replacements: [base, `${base}-%`],
        transaction,
      })
    ).map((r) => r.code);
    const code = nextBatchCode(base, taken);
    try {
      await sql().query(
        `INSERT INTO batches (code, recipe_version_id, spec_snapshot, volume_ml, remaining_ml, bottles, bottle_size_ml, temperature_c, measured_ph, ph_temperature_c,
                              prepared_by, prepared_at, expires_at, expiry_reason, status, idempotency_key, deviations, deviation_reason, room, created_at, updated_at)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 'ready', ?, ?, ?, ?, NOW(3), NOW(3))`,
        {
          transaction,
          replacements: [
            code,
            input.recipeVersionId,
            JSON.stringify(snapshot),
            input.volume_mL,
            input.volume_mL,
            input.bottles,
            input.bottleSize_mL,
            input.temperature_C,
            input.measuredPH ?? null,
            input.phMeterTemperature_C ?? null,
            actor.id,
            now,
            expiry.expiresAt,
            expiry.reason.slice(0, 300),
            input.idempotencyKey,
            deviations.length ? JSON.stringify(deviations) : null,
            deviations.length ? reason : null,
            input.room ?? null,
          ],
        },
      );
      return await lastInsertId(transaction);
    } catch (error) {
      if (error instanceof UniqueConstraintError && JSON.stringify(error.fields ?? {}).includes("code")) continue;
      throw error;
    }
  }
  throw new HttpError(503, "Could not allot a batch code; try again.");
}

interface BatchRow {
  id: number;
  code: string;
  recipe_id: number;
  recipe_code: string;
  recipe_name: string;
  version: number;
  recipe_version_id: number;
  channel: string | null;
  spec_snapshot: unknown;
  version_spec: unknown;
  storage: string | null;
  detection_nm: number | null;
  volume_ml: string;
  remaining_ml: string;
  bottles: number;
  bottle_size_ml: number;
  temperature_c: string;
  measured_ph: string | null;
  ph_temperature_c: string | null;
  prepared_at: Date;
  expires_at: Date;
  expiry_reason: string | null;
  prepared_by: string;
  status: BottleStatus;
  deviations: unknown;
  deviation_reason: string | null;
  room: string | null;
}

const num = (v: string | null) => (v === null ? null : Number(v));

export async function getBatch(id: number, now = new Date()): Promise<BatchDetail> {
  const [row] = await sql().query<BatchRow>(
    `SELECT b.id, b.code, r.id AS recipe_id, r.code AS recipe_code, r.name AS recipe_name, v.version, v.id AS recipe_version_id, r.channel, b.spec_snapshot, v.spec AS version_spec,
            v.storage, v.detection_nm, b.volume_ml, b.remaining_ml, b.bottles, b.bottle_size_ml, b.temperature_c, b.measured_ph, b.ph_temperature_c, b.prepared_at,
            b.expires_at, b.expiry_reason, u.name AS prepared_by, b.status, b.deviations, b.deviation_reason, b.room
       FROM batches b JOIN recipe_versions v ON v.id = b.recipe_version_id JOIN recipes r ON r.id = v.recipe_id JOIN users u ON u.id = b.prepared_by
      WHERE b.id = ?`,
    { type: QueryTypes.SELECT, replacements: [id] },
  );
  if (!row) throw new HttpError(404, `No batch with id ${id}.`);
  const components = await sql().query<{
    reagent_id: string;
    role: string;
    unit: "mL" | "g";
    target_amount: string;
    actual_amount: string | null;
    stock_lot_id: number | null;
    lot_number: string | null;
    assay_percent: string | number | null;
    assay_source: AssayUsed["source"] | null;
  }>(
    `SELECT c.reagent_id, c.role, c.unit, c.target_amount, c.actual_amount, c.stock_lot_id, l.lot_number, c.assay_percent, c.assay_source
       FROM batch_components c LEFT JOIN stock_lots l ON l.id = c.stock_lot_id WHERE c.batch_id = ? ORDER BY c.id`,
    { type: QueryTypes.SELECT, replacements: [id] },
  );
  const bottles = await sql().query<{ number: number; status: BottleStatus; discarded_ml: string | null }>(
    "SELECT number, status, discarded_ml FROM batch_bottles WHERE batch_id = ? ORDER BY number",
    { type: QueryTypes.SELECT, replacements: [id] },
  );
  // Batches from before snapshots held the specification fall back to their version's.
  const spec = parseSpec(row.spec_snapshot) ?? parseSpec(row.version_spec);
  const deviations = (typeof row.deviations === "string" ? JSON.parse(row.deviations) : row.deviations) as Deviation[] | null;
  const expiresAt = new Date(row.expires_at);
  return {
    id: row.id,
    code: row.code,
    recipeId: row.recipe_id,
    recipeCode: row.recipe_code,
    recipeName: row.recipe_name,
    recipeVersion: row.version,
    recipeVersionId: row.recipe_version_id,
    channel: row.channel,
    spec,
    composition: spec ? describeSpec(spec) : row.recipe_name,
    storage: row.storage,
    detection_nm: row.detection_nm,
    volume_mL: Number(row.volume_ml),
    remaining_mL: Number(row.remaining_ml),
    bottles: row.bottles,
    bottleSize_mL: row.bottle_size_ml,
    temperature_C: Number(row.temperature_c),
    measuredPH: num(row.measured_ph),
    phMeterTemperature_C: num(row.ph_temperature_c),
    targetPH: spec?.buffer?.targetPH ?? null,
    preparedAt: new Date(row.prepared_at).toISOString(),
    expiresAt: expiresAt.toISOString(),
    expiryReason: row.expiry_reason,
    preparedBy: row.prepared_by,
    status: row.status,
    room: row.room,
    expired: expiresAt <= now,
    deviations: deviations ?? [],
    deviationReason: row.deviation_reason,
    components: components.map((c) => ({
      reagent: c.reagent_id,
      name: getReagent(c.reagent_id)?.name ?? c.reagent_id,
      role: c.role,
      unit: c.unit,
      target: Number(c.target_amount),
      actual: num(c.actual_amount),
      stockLotId: c.stock_lot_id,
      lotNumber: c.lot_number,
      assay: c.assay_source === null || c.assay_percent === null ? null : { percent: Number(c.assay_percent), source: c.assay_source },
    })),
    bottleList: bottles.map((b) => ({ number: b.number, status: b.status, discarded_mL: num(b.discarded_ml) })),
  };
}

export async function findBatchByCode(code: string): Promise<number> {
  const clean = code.trim().toUpperCase();
  const [row] = await sql().query<{ id: number }>("SELECT id FROM batches WHERE code = ?", {
    type: QueryTypes.SELECT,
    replacements: [clean],
  });
  if (!row) throw new HttpError(404, `code: no batch with the code ${clean}`);
  return row.id;
}

const STREAM_RANK: Record<string, number> = {
  aqueous: 1,
  "non-halogenated-organic": 2,
  "acidic-corrosive": 3,
  "basic-corrosive": 3,
  "halogenated-organic": 4,
};

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
  await inTransaction(sql(), async (transaction) => {
    await sql().query("SELECT id FROM batches WHERE id = ? FOR UPDATE", { type: QueryTypes.SELECT, replacements: [batchId], transaction });
    await sql().query(
      "UPDATE batch_bottles SET status = ?, discarded_ml = ?, updated_by = ?, updated_at = NOW(3) WHERE batch_id = ? AND number = ?",
      {
        replacements: [change.status, change.status === "discarded" ? discarded.toFixed(4) : null, actor.id, batchId, number],
        transaction,
      },
    );
    if (discarded > 0) {
      const liquids = batch.components.filter((c) => c.unit === "mL");
      const total = liquids.reduce((a, c) => a + (c.actual ?? c.target), 0) || 1;
      const stream =
        liquids
          .map((c) => wasteStreamOf(c.reagent))
          .filter((s): s is string => s !== null)
          .sort((a, b) => (STREAM_RANK[b] ?? 2) - (STREAM_RANK[a] ?? 2))[0] ?? null;
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
      await sql().query("UPDATE batches SET remaining_ml = GREATEST(0, remaining_ml - ?) WHERE id = ?", {
        replacements: [discarded.toFixed(4), batchId],
        transaction,
      });
    }
    const statuses = batch.bottleList.map((b) => (b.number === number ? change.status : b.status));
    const batchStatus = statuses.every((s) => s === "discarded")
      ? "discarded"
      : statuses.every((s) => s === "empty" || s === "discarded")
        ? "empty"
        : statuses.some((s) => s === "in_use")
          ? "in_use"
          : "ready";
    await sql().query("UPDATE batches SET status = ?, updated_at = NOW(3) WHERE id = ?", {
      replacements: [batchStatus, batchId],
      transaction,
    });
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

/** What the label of this batch says. */
export function labelContentOf(batch: BatchDetail): LabelContent {
  // Older batches recorded without components take them from their recipe's plan.
  let parts: PlannedComponent[] = batch.components.map((c) => ({
    reagent: c.reagent,
    name: c.name,
    role: "solvent",
    unit: c.unit,
    target: c.actual ?? c.target,
  }));
  if (parts.length === 0 && batch.spec) {
    try {
      parts = preparationPlan({ spec: batch.spec, volume_mL: batch.volume_mL }).components;
    } catch {
      parts = [];
    }
  }
  const hazards = hazardSummary(componentShares({ components: parts, finalVolume_mL: batch.volume_mL }));
  const when = (iso: string) => iso.slice(0, 16).replace("T", " ");
  const deviation = batch.deviations.length
    ? `${batch.deviations.map((d) => d.message.split(" (tolerance")[0]).join("; ")}. Reason: ${batch.deviationReason ?? "not given"}`
    : null;
  return {
    code: batch.code,
    name: batch.recipeName,
    composition: batch.composition + (batch.measuredPH !== null ? ` · measured pH ${batch.measuredPH.toFixed(2)}` : ""),
    prepared: `${when(batch.preparedAt)} UTC`,
    expires: `${when(batch.expiresAt)} UTC`,
    preparer: batch.preparedBy,
    bottles: batch.bottles,
    storage: batch.storage,
    pictograms: hazards.pictograms,
    signalWord: hazards.signalWord,
    hazardStatements: hazards.statements,
    deviation,
    channel: batch.channel,
  };
}

/** Batches still on the bench whose expiry falls within the next `hours` (or has passed today). */
export async function batchesDueSoon(
  hours = 24,
  now = new Date(),
): Promise<{ id: number; code: string; recipeName: string; expiresAt: string; expired: boolean }[]> {
  const rows = await sql().query<{ id: number; code: string; name: string; expires_at: Date }>(
    `SELECT b.id, b.code, r.name, b.expires_at FROM batches b JOIN recipe_versions v ON v.id = b.recipe_version_id JOIN recipes r ON r.id = v.recipe_id
      WHERE b.status IN ('ready', 'in_use') AND b.expires_at <= ? ORDER BY b.expires_at`,
    { type: QueryTypes.SELECT, replacements: [new Date(now.getTime() + hours * 3_600_000)] },
  );
  return rows.map((r) => ({
    id: r.id,
    code: r.code,
    recipeName: r.name,
    expiresAt: new Date(r.expires_at).toISOString(),
    expired: new Date(r.expires_at) <= now,
  }));
}

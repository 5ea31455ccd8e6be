/**
 * What the batch screens read: the list (`/batches`, `GET /api/batches`), one batch with its
 * components and bottles (`/batches/:id`), the lookup by the code on a bottle, and the batches
 * about to expire (home page).
 */
import type { AssayUsed } from "../../preparation/lot-assays";
import { getReagent } from "../../chem";
import type { Deviation } from "../../preparation/deviations";
import { describeSpec } from "../../preparation/plan";
import type { BatchDetail, BatchSummary, BottleStatus } from "../../preparation/types";
import { recipeSpecSchema, type RecipeSpec } from "../../schemas/recipes";
import { HttpError } from "../http";
import { jsonColumn, select, selectOne } from "../query";

interface BatchListRow {
  id: number;
  code: string;
  recipe_code: string;
  recipe_name: string;
  version: number;
  channel: string | null;
  volume_ml: number;
  remaining_ml: number;
  bottles: number;
  status: string;
  prepared_at: Date;
  expires_at: Date;
  prepared_by: string;
  measured_ph: number | null;
}

/** Batches, newest first, with the recipe they were made from. */
export async function listBatches(options: { status?: string; limit?: number } = {}, now = new Date()): Promise<BatchSummary[]> {
  const rows = await select<BatchListRow>(
    `SELECT b.id, b.code, r.code AS recipe_code, r.name AS recipe_name, v.version, r.channel, b.volume_ml, b.remaining_ml,
            b.bottles, b.status, b.prepared_at, b.expires_at, u.name AS prepared_by, b.measured_ph
       FROM batches b
       JOIN recipe_versions v ON v.id = b.recipe_version_id
       JOIN recipes r ON r.id = v.recipe_id
       JOIN users u ON u.id = b.prepared_by
      WHERE (:status IS NULL OR b.status = :status)
      ORDER BY b.prepared_at DESC, b.id DESC
      LIMIT :limit`,
    { replacements: { status: options.status ?? null, limit: options.limit ?? 200 } },
  );
  return rows.map((row) => ({
    id: row.id,
    code: row.code,
    recipeCode: row.recipe_code,
    recipeName: row.recipe_name,
    recipeVersion: row.version,
    channel: row.channel,
    volume_mL: row.volume_ml,
    remaining_mL: row.remaining_ml,
    bottles: row.bottles,
    status: row.status,
    preparedAt: new Date(row.prepared_at).toISOString(),
    expiresAt: new Date(row.expires_at).toISOString(),
    preparedBy: row.prepared_by,
    measuredPH: row.measured_ph,
    expired: new Date(row.expires_at) <= now,
  }));
}

/** A stored specification (or a snapshot holding one), or null when it no longer parses. */
function parseSpec(raw: unknown): RecipeSpec | null {
  try {
    const value = jsonColumn(raw);
    const candidate = value && typeof value === "object" && "spec" in value ? (value as { spec: unknown }).spec : value;
    return recipeSpecSchema.parse(candidate);
  } catch {
    return null;
  }
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
  volume_ml: number;
  remaining_ml: number;
  bottles: number;
  bottle_size_ml: number;
  temperature_c: number;
  measured_ph: number | null;
  ph_temperature_c: number | null;
  prepared_at: Date;
  expires_at: Date;
  expiry_reason: string | null;
  prepared_by: string;
  status: BottleStatus;
  deviations: unknown;
  deviation_reason: string | null;
  room: string | null;
}

export async function getBatch(id: number, now = new Date()): Promise<BatchDetail> {
  const row = await selectOne<BatchRow>(
    `SELECT b.id, b.code, r.id AS recipe_id, r.code AS recipe_code, r.name AS recipe_name, v.version, v.id AS recipe_version_id, r.channel, b.spec_snapshot, v.spec AS version_spec,
            v.storage, v.detection_nm, b.volume_ml, b.remaining_ml, b.bottles, b.bottle_size_ml, b.temperature_c, b.measured_ph, b.ph_temperature_c, b.prepared_at,
            b.expires_at, b.expiry_reason, u.name AS prepared_by, b.status, b.deviations, b.deviation_reason, b.room
       FROM batches b JOIN recipe_versions v ON v.id = b.recipe_version_id JOIN recipes r ON r.id = v.recipe_id JOIN users u ON u.id = b.prepared_by
      WHERE b.id = ?`,
    { replacements: [id] },
  );
  if (!row) throw new HttpError(404, `No batch with id ${id}.`);
  const components = await select<{
    reagent_id: string;
    role: string;
    unit: "mL" | "g";
    target_amount: number;
    actual_amount: number | null;
    stock_lot_id: number | null;
    lot_number: string | null;
    assay_percent: number | null;
    assay_source: AssayUsed["source"] | null;
  }>(
    `SELECT c.reagent_id, c.role, c.unit, c.target_amount, c.actual_amount, c.stock_lot_id, l.lot_number, c.assay_percent, c.assay_source
       FROM batch_components c LEFT JOIN stock_lots l ON l.id = c.stock_lot_id WHERE c.batch_id = ? ORDER BY c.id`,
    { replacements: [id] },
  );
  const bottles = await select<{ number: number; status: BottleStatus; discarded_ml: number | null }>(
    "SELECT number, status, discarded_ml FROM batch_bottles WHERE batch_id = ? ORDER BY number",
    { replacements: [id] },
  );
  // Batches from before snapshots held the specification fall back to their version's.
  const spec = parseSpec(row.spec_snapshot) ?? parseSpec(row.version_spec);
  const deviations = jsonColumn<Deviation[] | null>(row.deviations);
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
    volume_mL: row.volume_ml,
    remaining_mL: row.remaining_ml,
    bottles: row.bottles,
    bottleSize_mL: row.bottle_size_ml,
    temperature_C: row.temperature_c,
    measuredPH: row.measured_ph,
    phMeterTemperature_C: row.ph_temperature_c,
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
      target: c.target_amount,
      actual: c.actual_amount,
      stockLotId: c.stock_lot_id,
      lotNumber: c.lot_number,
      assay: c.assay_source === null || c.assay_percent === null ? null : { percent: c.assay_percent, source: c.assay_source },
    })),
    bottleList: bottles.map((b) => ({ number: b.number, status: b.status, discarded_mL: b.discarded_ml })),
  };
}

/** The id of the batch with the code printed on a bottle. */
export async function findBatchByCode(code: string): Promise<number> {
  const clean = code.trim().toUpperCase();
  const row = await selectOne<{ id: number }>("SELECT id FROM batches WHERE code = ?", { replacements: [clean] });
  if (!row) throw new HttpError(404, `code: no batch with the code ${clean}`);
  return row.id;
}

/** Batches still on the bench whose expiry falls within the next `hours` (or has passed today). */
export async function batchesDueSoon(
  hours = 24,
  now = new Date(),
): Promise<{ id: number; code: string; recipeName: string; expiresAt: string; expired: boolean }[]> {
  const rows = await select<{ id: number; code: string; name: string; expires_at: Date }>(
    `SELECT b.id, b.code, r.name, b.expires_at FROM batches b JOIN recipe_versions v ON v.id = b.recipe_version_id JOIN recipes r ON r.id = v.recipe_id
      WHERE b.status IN ('ready', 'in_use') AND b.expires_at <= ? ORDER BY b.expires_at`,
    { replacements: [new Date(now.getTime() + hours * 3_600_000)] },
  );
  return rows.map((r) => ({
    id: r.id,
    code: r.code,
    recipeName: r.name,
    expiresAt: new Date(r.expires_at).toISOString(),
    expired: new Date(r.expires_at) <= now,
  }));
}

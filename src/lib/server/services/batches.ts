import { QueryTypes } from "sequelize";
import { getSequelize } from "../db";

export interface BatchSummary {
  id: number;
  code: string;
  recipeCode: string;
  recipeName: string;
  recipeVersion: number;
  channel: string | null;
  volume_mL: number;
  remaining_mL: number;
  bottles: number;
  status: string;
  preparedAt: string;
  expiresAt: string;
  preparedBy: string;
  measuredPH: number | null;
  expired: boolean;
}

interface BatchRow {
  id: number;
  code: string;
  recipe_code: string;
  recipe_name: string;
  version: number;
  channel: string | null;
  volume_ml: string;
  remaining_ml: string;
  bottles: number;
  status: string;
  prepared_at: Date;
  expires_at: Date;
  prepared_by: string;
  measured_ph: string | null;
}

/** Batches, newest first, with the recipe they were made from. */
export async function listBatches(options: { status?: string; limit?: number } = {}, now = new Date()): Promise<BatchSummary[]> {
  const rows = await getSequelize().query<BatchRow>(
    `SELECT b.id, b.code, r.code AS recipe_code, r.name AS recipe_name, v.version, r.channel, b.volume_ml, b.remaining_ml,
            b.bottles, b.status, b.prepared_at, b.expires_at, u.name AS prepared_by, b.measured_ph
       FROM batches b
       JOIN recipe_versions v ON v.id = b.recipe_version_id
       JOIN recipes r ON r.id = v.recipe_id
       JOIN users u ON u.id = b.prepared_by
      WHERE (:status IS NULL OR b.status = :status)
      ORDER BY b.prepared_at DESC, b.id DESC
      LIMIT :limit`,
    { type: QueryTypes.SELECT, replacements: { status: options.status ?? null, limit: options.limit ?? 200 } },
  );
  return rows.map((row) => ({
    id: row.id,
    code: row.code,
    recipeCode: row.recipe_code,
    recipeName: row.recipe_name,
    recipeVersion: row.version,
    channel: row.channel,
    volume_mL: Number(row.volume_ml),
    remaining_mL: Number(row.remaining_ml),
    bottles: row.bottles,
    status: row.status,
    preparedAt: new Date(row.prepared_at).toISOString(),
    expiresAt: new Date(row.expires_at).toISOString(),
    preparedBy: row.prepared_by,
    measuredPH: row.measured_ph === null ? null : Number(row.measured_ph),
    expired: new Date(row.expires_at) <= now,
  }));
}

/** Stock lots: reagents as received, their certificates, and whether a batch may take from them. */
import { UniqueConstraintError, type Transaction } from "sequelize";
import { getReagent } from "../../chem";
import { lotExpired } from "../../preparation/expiry";
import type { StockLotSummary } from "../../preparation/types";
import type { StockLotInput } from "../../schemas/stock-lots";
import { recordAudit } from "../audit";
import { getSequelize } from "../db";
import type { SignedInUser } from "../guard";
import { HttpError } from "../http";
import { execute, select, selectOne } from "../query";
import { readUpload, removeUpload, storeCertificate } from "../storage";
import { inTransaction } from "./sql";
import { ensureCatalogueRows } from "./ledger";

/** A lot is low when less than this share of what was received is left (or below the reagent's reorder level). */
export const LOW_STOCK_FRACTION = 0.15;

interface LotRow {
  id: number;
  reagent_id: string;
  lot_number: string;
  supplier: string;
  grade: string;
  received_on: string | Date;
  opened_on: string | Date | null;
  expires_on: string | Date;
  quantity: number;
  remaining: number;
  room: string | null;
  assay_percent: number | null;
  density_g_ml: number | null;
  certificate_path: string | null;
  certificate_name: string | null;
  reorder_level: number | null;
  unit: "mL" | "g" | null;
}

const day = (d: string | Date | null) => (d === null ? null : typeof d === "string" ? d.slice(0, 10) : d.toISOString().slice(0, 10));

function summarise(row: LotRow, now: Date): StockLotSummary {
  const reagent = getReagent(row.reagent_id);
  const { quantity, remaining } = row;
  const expiresOn = day(row.expires_on)!;
  const expired = lotExpired(expiresOn, now);
  const reorder = row.reorder_level;
  const low = remaining < quantity * LOW_STOCK_FRACTION || (reorder !== null && remaining < reorder);
  return {
    id: row.id,
    reagent: row.reagent_id,
    reagentName: reagent?.name ?? row.reagent_id,
    unit: row.unit ?? (reagent?.form === "solid" ? "g" : "mL"),
    lotNumber: row.lot_number,
    supplier: row.supplier,
    grade: row.grade,
    receivedOn: day(row.received_on)!,
    openedOn: day(row.opened_on),
    expiresOn,
    quantity,
    remaining,
    room: row.room,
    assayPercent: row.assay_percent,
    density_g_mL: row.density_g_ml,
    hasCertificate: row.certificate_path !== null,
    certificateName: row.certificate_name,
    expired,
    low,
    usable: !expired && remaining > 0,
  };
}

const SELECT = `SELECT l.id, l.reagent_id, l.lot_number, l.supplier, l.grade, l.received_on, l.opened_on, l.expires_on, l.quantity, l.remaining, l.room,
                       l.assay_percent, l.density_g_ml, l.certificate_path, l.certificate_name, r.reorder_level, r.unit
                  FROM stock_lots l LEFT JOIN reagents r ON r.id = l.reagent_id`;

export async function listStockLots(
  filter: { reagent?: string | undefined; q?: string | undefined; state?: "all" | "usable" | "expired" | "low" } = {},
  now = new Date(),
): Promise<StockLotSummary[]> {
  const rows = await select<LotRow>(
    `${SELECT} WHERE (:reagent IS NULL OR l.reagent_id = :reagent)
        AND (:q IS NULL OR l.lot_number LIKE :like OR l.supplier LIKE :like OR l.reagent_id LIKE :like)
      ORDER BY l.reagent_id, l.expires_on, l.id`,
    { replacements: { reagent: filter.reagent ?? null, q: filter.q ?? null, like: `%${filter.q ?? ""}%` } },
  );
  const lots = rows.map((r) => summarise(r, now));
  switch (filter.state ?? "all") {
    case "usable":
      return lots.filter((l) => l.usable);
    case "expired":
      return lots.filter((l) => l.expired);
    case "low":
      return lots.filter((l) => l.low);
    default:
      return lots;
  }
}

export async function getStockLots(
  ids: readonly number[],
  now = new Date(),
  transaction?: Transaction,
): Promise<Map<number, StockLotSummary>> {
  if (ids.length === 0) return new Map();
  const rows = await select<LotRow>(`${SELECT} WHERE l.id IN (:ids)`, { replacements: { ids: [...ids] }, transaction });
  return new Map(rows.map((r) => [r.id, summarise(r, now)]));
}

export async function createStockLot(
  input: StockLotInput,
  certificate: { bytes: Uint8Array; name: string } | null,
  actor: SignedInUser,
  ip: string | null = null,
): Promise<StockLotSummary> {
  // The file is checked (type by content, size) before anything is written to the database.
  const stored = certificate ? await storeCertificate(certificate.bytes) : null;
  let id = 0;
  try {
    await inTransaction(getSequelize(), async (transaction) => {
      await ensureCatalogueRows([input.reagent], transaction);
      ({ insertId: id } = await execute(
        `INSERT INTO stock_lots (reagent_id, lot_number, supplier, grade, received_on, opened_on, expires_on, quantity, remaining, room,
                                 assay_percent, density_g_ml, certificate_path, certificate_name, certificate_type, certificate_size, created_by, created_at, updated_at)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, NOW(3), NOW(3))`,
        {
          transaction,
          replacements: [
            input.reagent,
            input.lotNumber,
            input.supplier,
            input.grade,
            input.receivedOn,
            input.openedOn ?? null,
            input.expiresOn,
            input.quantity,
            input.remaining ?? input.quantity,
            input.room ?? null,
            input.assayPercent ?? null,
            input.density_g_mL ?? null,
            stored?.key ?? null,
            certificate ? certificate.name.slice(0, 255) : null,
            stored?.mime ?? null,
            stored?.size ?? null,
            actor.id,
          ],
        },
      ));
      await recordAudit(
        {
          actorId: actor.id,
          action: "create",
          entity: "stock-lot",
          entityId: id,
          ip,
          after: { ...input, certificate: stored?.key ?? null },
        },
        transaction,
      );
    });
  } catch (error) {
    // The lot was not recorded: its certificate must not stay behind in storage.
    if (stored) await removeUpload(stored.key).catch(() => undefined);
    if (error instanceof UniqueConstraintError)
      throw new HttpError(
        409,
        `lotNumber: lot ${input.lotNumber} of ${getReagent(input.reagent)?.name ?? input.reagent} is already recorded`,
      );
    throw error;
  }
  return (await getStockLots([id])).get(id)!;
}

export async function getCertificate(lotId: number): Promise<{ bytes: Buffer; mime: string; name: string }> {
  const row = await selectOne<{ certificate_path: string | null; certificate_type: string | null; certificate_name: string | null }>(
    "SELECT certificate_path, certificate_type, certificate_name FROM stock_lots WHERE id = ?",
    { replacements: [lotId] },
  );
  if (!row?.certificate_path) throw new HttpError(404, "This lot has no certificate of analysis on file.");
  return {
    bytes: await readUpload(row.certificate_path),
    mime: row.certificate_type ?? "application/octet-stream",
    name: row.certificate_name ?? "certificate",
  };
}

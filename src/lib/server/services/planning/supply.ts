/**
 * Supply of every reagent: on hand (usable stock lots, plus each live batch's remaining volume times
 * the reagent's share of it), use over the last 30 and 90 days from the ledger (runs, draws and
 * discards, less their corrections), and the reorder point from the reagent's lead time and
 * safety stock (defaults where a reagent has none of its own).
 */
import { getReagent } from "../../../chem/reagents";
import { runsOutOn, supplyStatus } from "../../../planning/supply";
import type { SupplyRow } from "../../../planning/types";
import type { SupplySettingInput } from "../../../schemas/planning";
import { recordAudit } from "../../audit";
import { getSequelize } from "../../db";
import type { SignedInUser } from "../../guard";
import { HttpError } from "../../http";
import { execute, select, selectOne } from "../../query";
import { loadBatches } from "../batch-use";
import { inTransaction } from "../sql";

const DAY = 86_400_000;
/** Lead time where a reagent has none of its own (an example value; set each reagent's own). */
export const DEFAULT_LEAD_TIME_DAYS = 14;
const DEFAULT_LEAD_TIME_KEY = "supply.defaultLeadTime_days";

/** A settings value as read raw: the driver hands JSON columns back decoded or as text. */
export function settingValue(raw: unknown): unknown {
  if (typeof raw !== "string") return raw;
  try {
    return JSON.parse(raw) as unknown;
  } catch {
    return raw;
  }
}

async function defaultLeadTime(): Promise<number> {
  const row = await selectOne<{ value: unknown }>("SELECT value FROM settings WHERE `key` = ?", { replacements: [DEFAULT_LEAD_TIME_KEY] });
  const v = row ? Number(settingValue(row.value)) : Number.NaN;
  return Number.isFinite(v) && v >= 0 ? v : DEFAULT_LEAD_TIME_DAYS;
}

/** Used amount per reagent since `since` (mL for liquids, g for solids). */
async function usedSince(since: Date, until: Date): Promise<Map<string, { mL: number; g: number }>> {
  const rows = await select<{ reagent_id: string; volume: number | null; mass: number | null }>(
    `SELECT le.reagent_id, SUM(le.volume_ml) AS volume, SUM(le.mass_g) AS mass
       FROM ledger_entries le LEFT JOIN ledger_entries o ON o.id = le.reverses_id
      WHERE le.occurred_at >= :since AND le.occurred_at < :until
        AND (le.kind IN ('run', 'draw', 'discard') OR (le.kind = 'correction' AND o.kind IN ('run', 'draw', 'discard')))
      GROUP BY le.reagent_id`,
    { replacements: { since, until } },
  );
  return new Map(rows.map((r) => [r.reagent_id, { mL: Number(r.volume ?? 0), g: Number(r.mass ?? 0) }]));
}

export async function supplyOverview(now = new Date()): Promise<SupplyRow[]> {
  const today = now.toISOString().slice(0, 10);
  const [reagents, lots, live, settings, used30, used90, fallbackLead] = await Promise.all([
    select<{ id: string; name: string; unit: "mL" | "g" }>("SELECT id, name, unit FROM reagents WHERE active = 1 ORDER BY name"),
    select<{ reagent_id: string; remaining: number }>(
      "SELECT reagent_id, SUM(remaining) AS remaining FROM stock_lots WHERE expires_on >= ? GROUP BY reagent_id",
      { replacements: [today] },
    ),
    select<{ id: number }>("SELECT id FROM batches WHERE status IN ('ready', 'in_use') AND expires_at > ? AND remaining_ml > 0", {
      replacements: [now],
    }),
    select<{ reagent_id: string; lead_time_days: number; safety_stock: number }>(
      "SELECT reagent_id, lead_time_days, safety_stock FROM reagent_supply",
    ),
    usedSince(new Date(now.getTime() - 30 * DAY), now),
    usedSince(new Date(now.getTime() - 90 * DAY), now),
    defaultLeadTime(),
  ]);
  const stock = new Map(lots.map((l) => [l.reagent_id, Number(l.remaining)]));
  const inBatches = new Map<string, { mL: number; g: number }>();
  const batches = await loadBatches({ ids: live.map((b) => b.id) });
  for (const b of batches.values()) {
    if (!(b.composition.volume_mL > 0)) continue;
    const fraction = b.remaining_mL / b.composition.volume_mL;
    for (const part of b.composition.parts) {
      const acc = inBatches.get(part.reagentId) ?? { mL: 0, g: 0 };
      if (part.unit === "mL") acc.mL += part.amount * fraction;
      else acc.g += part.amount * fraction;
      inBatches.set(part.reagentId, acc);
    }
  }
  const own = new Map(settings.map((s) => [s.reagent_id, s]));
  const rows: SupplyRow[] = [];
  for (const r of reagents) {
    const pick = (m: { mL: number; g: number } | undefined) => (m ? (r.unit === "g" ? m.g : m.mL) : 0);
    const s = own.get(r.id);
    const leadTime_days = s ? Number(s.lead_time_days) : fallbackLead;
    const safetyStock = s ? Number(s.safety_stock) : 0;
    const stockAmount = stock.get(r.id) ?? 0;
    const batchAmount = pick(inBatches.get(r.id));
    const u30 = pick(used30.get(r.id));
    const u90 = pick(used90.get(r.id));
    if (stockAmount === 0 && batchAmount === 0 && u90 === 0 && !s) continue;
    const status = supplyStatus({ onHand: stockAmount + batchAmount, used30: u30, used90: u90, leadTime_days, safetyStock });
    rows.push({
      reagentId: r.id,
      name: getReagent(r.id)?.name ?? r.name,
      unit: r.unit,
      stock: stockAmount,
      batches: batchAmount,
      onHand: stockAmount + batchAmount,
      used30: u30,
      used90: u90,
      perDay: status.perDay,
      daysOfSupply: Number.isFinite(status.daysOfSupply) ? status.daysOfSupply : null,
      leadTime_days,
      safetyStock,
      defaults: !s,
      reorderPoint: status.reorderPoint,
      state: status.state,
      runsOutOn: runsOutOn(status, now),
      suggestedOrder: status.suggestedOrder,
    });
  }
  const rank = { "runs-out": 0, reorder: 1, ok: 2 } as const;
  return rows.sort(
    (a, b) => rank[a.state] - rank[b.state] || (a.daysOfSupply ?? Infinity) - (b.daysOfSupply ?? Infinity) || a.name.localeCompare(b.name),
  );
}

export async function saveSupplySetting(input: SupplySettingInput, actor: SignedInUser): Promise<void> {
  const known = await selectOne<{ id: string }>("SELECT id FROM reagents WHERE id = ?", { replacements: [input.reagentId] });
  if (!known) throw new HttpError(404, `reagentId: no reagent ${input.reagentId}`);
  await inTransaction(getSequelize(), async (transaction) => {
    const before = await selectOne<{ lead_time_days: number; safety_stock: number }>(
      "SELECT lead_time_days, safety_stock FROM reagent_supply WHERE reagent_id = ?",
      {
        replacements: [input.reagentId],
        transaction,
      },
    );
    await execute(
      `INSERT INTO reagent_supply (reagent_id, lead_time_days, safety_stock, updated_by, updated_at) VALUES (?, ?, ?, ?, NOW(3))
       ON DUPLICATE KEY UPDATE lead_time_days = VALUES(lead_time_days), safety_stock = VALUES(safety_stock), updated_by = VALUES(updated_by), updated_at = NOW(3)`,
      { replacements: [input.reagentId, input.leadTime_days, input.safetyStock, actor.id], transaction },
    );
    await recordAudit(
      { actorId: actor.id, action: "update", entity: "reagent-supply", entityId: input.reagentId, before: before ?? null, after: input },
      transaction,
    );
  });
}

// Flammable liquids on hand per room (/waste, /home): stock lots, live batches and live waste containers.
import { flammableShare, flammablesByRoomFrom, type BatchComponentVolume } from "../../../waste/flammables";
import type { FlammablesInRoom } from "../../../waste/types";
import { select } from "../../query";
import { listContainers } from "./containers";
import { readWasteSettings } from "./settings";

interface BatchPartRow {
  id: number;
  room: string;
  remaining_ml: number;
  /** Null for a batch without components (LEFT JOIN). */
  reagent_id: string | null;
  unit: string | null;
  amount: number | null;
  table_flammable: number | null;
}

/** Live batches (ready or in use, something left) with their remaining volume and their flammable share. */
async function liveBatches(): Promise<{ room: string; remaining_mL: number; share: number }[]> {
  const parts = await select<BatchPartRow>(
    `SELECT b.id, COALESCE(b.room, 'unassigned') AS room, b.remaining_ml, c.reagent_id, c.unit,
            COALESCE(c.actual_amount, c.target_amount) AS amount, r.flammable AS table_flammable
       FROM batches b
       LEFT JOIN batch_components c ON c.batch_id = b.id
       LEFT JOIN reagents r ON r.id = c.reagent_id
      WHERE b.status IN ('ready', 'in_use') AND b.remaining_ml > 0`,
  );
  const batches = new Map<number, { room: string; remaining_mL: number; parts: BatchComponentVolume[] }>();
  for (const p of parts) {
    const b = batches.get(p.id) ?? batches.set(p.id, { room: p.room, remaining_mL: p.remaining_ml, parts: [] }).get(p.id)!;
    if (p.reagent_id && p.unit)
      b.parts.push({ reagentId: p.reagent_id, unit: p.unit, amount_mL: p.amount ?? 0, tableFlammable: p.table_flammable === 1 });
  }
  return [...batches.values()].map((b) => ({ room: b.room, remaining_mL: b.remaining_mL, share: flammableShare(b.parts) }));
}

/** Flammable liquids on hand per room (stock lots, live batches and waste), against the room limit the safety officer sets. */
export async function flammablesByRoom(now = new Date()): Promise<FlammablesInRoom[]> {
  const [stock, batches, shares, containers, settings] = await Promise.all([
    select<{ room: string; remaining: number }>(
      `SELECT COALESCE(l.room, 'unassigned') AS room, SUM(l.remaining) AS remaining
         FROM stock_lots l JOIN reagents r ON r.id = l.reagent_id
        WHERE r.flammable = 1 AND r.unit = 'mL' AND l.remaining > 0
        GROUP BY COALESCE(l.room, 'unassigned')`,
    ),
    liveBatches(),
    // The flammable fraction of what went into each live container during its accumulation.
    select<{ id: number; flammable: number | null; total: number | null }>(
      `SELECT c.id, SUM(CASE WHEN r.flammable = 1 THEN l.volume_ml ELSE 0 END) AS flammable, SUM(l.volume_ml) AS total
         FROM waste_containers c
         JOIN ledger_entries l ON l.waste_container_id = c.id AND (c.accumulation_started_at IS NULL OR l.occurred_at >= c.accumulation_started_at)
         JOIN reagents r ON r.id = l.reagent_id
        WHERE c.status <> 'collected'
        GROUP BY c.id`,
    ),
    listContainers({ now }),
    readWasteSettings(),
  ]);
  const fractionOf = (id: number) => {
    const share = shares.find((s) => s.id === id);
    return share?.total && share.total > 0 ? (share.flammable ?? 0) / share.total : 0;
  };
  return flammablesByRoomFrom(
    {
      stock: stock.map((s) => ({ room: s.room, remaining_mL: s.remaining })),
      batches,
      containers: containers.map((c) => ({ room: c.room, estimated_mL: c.estimated_mL, fraction: fractionOf(c.id) })),
    },
    settings.roomLimits_L,
  );
}

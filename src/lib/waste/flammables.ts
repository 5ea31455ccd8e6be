/**
 * Flammable liquids on hand per room, against the room limits the safety officer sets. Pure: the
 * service gathers stock lots, live batches and live waste containers; this adds them up.
 *
 * The limits are example values; fire codes and the institution decide the real ones.
 */
import { getReagent } from "../chem";
import type { FlammablesInRoom } from "./types";

/** From this share of its limit a room is "near" (common practice, not a regulation). */
export const NEAR_LIMIT_SHARE = 0.8;

export interface BatchComponentVolume {
  reagentId: string;
  unit: string;
  amount_mL: number;
  /** The reagents table's flag, for a reagent the catalogue lacks. */
  tableFlammable?: boolean;
}

/**
 * The flammable share of a batch (v/v): its flammable liquid components (the catalogue's flag;
 * the reagents table's for a reagent the catalogue lacks) over all its liquid components.
 */
export function flammableShare(components: readonly BatchComponentVolume[]): number {
  const liquids = components.filter((c) => c.unit === "mL");
  const total = liquids.reduce((sum, c) => sum + Math.max(0, c.amount_mL), 0);
  if (!(total > 0)) return 0;
  const flammable = liquids
    .filter((c) => getReagent(c.reagentId)?.flammable ?? c.tableFlammable ?? false)
    .reduce((sum, c) => sum + Math.max(0, c.amount_mL), 0);
  return Math.min(1, flammable / total);
}

export function flammableState(onHand_L: number, limit_L: number | null): FlammablesInRoom["state"] {
  if (limit_L === null) return "no-limit";
  return onHand_L >= limit_L ? "over" : onHand_L >= NEAR_LIMIT_SHARE * limit_L ? "near" : "ok";
}

export interface FlammableHoldings {
  /** Flammable reagents left in stock lots, per lot or per room. */
  stock: readonly { room: string; remaining_mL: number }[];
  /** Live batches: what is left of each and its flammable share (`flammableShare`). */
  batches: readonly { room: string; remaining_mL: number; share: number }[];
  /** Live waste containers: the estimate and the flammable fraction of what went in. */
  containers: readonly { room: string; estimated_mL: number; fraction: number }[];
}

/** Litres on hand per room, every room with a limit included, by room name. */
export function flammablesByRoomFrom(holdings: FlammableHoldings, roomLimits_L: Readonly<Record<string, number>>): FlammablesInRoom[] {
  const rooms = new Map<string, { stock: number; batches: number; waste: number }>();
  const at = (room: string) => rooms.get(room) ?? rooms.set(room, { stock: 0, batches: 0, waste: 0 }).get(room)!;
  for (const s of holdings.stock) at(s.room).stock += s.remaining_mL / 1000;
  for (const b of holdings.batches) if (b.share > 0) at(b.room).batches += (b.remaining_mL * b.share) / 1000;
  for (const c of holdings.containers) {
    const fraction = Math.min(1, Math.max(0, c.fraction));
    if (fraction > 0) at(c.room).waste += (c.estimated_mL * fraction) / 1000;
  }
  for (const room of Object.keys(roomLimits_L)) at(room);
  const r2 = (x: number) => Math.round(x * 100) / 100;
  return [...rooms]
    .map(([room, v]) => {
      const onHand = v.stock + v.batches + v.waste;
      const limit = roomLimits_L[room] ?? null;
      return {
        room,
        stock_L: r2(v.stock),
        batches_L: r2(v.batches),
        waste_L: r2(v.waste),
        onHand_L: r2(onHand),
        limit_L: limit,
        state: flammableState(onHand, limit),
      };
    })
    .sort((a, b) => a.room.localeCompare(b.room));
}

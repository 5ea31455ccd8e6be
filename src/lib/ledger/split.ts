/**
 * From a channel's volume to the reagents in it. Pure: the run form shows the same split the
 * server writes to the ledger.
 *
 * A batch's composition is what went into it: liquids in mL (measured separately before mixing,
 * the usual HPLC convention) and solids in g. A volume V drawn from the batch splits as
 *   liquid i: V × vᵢ / Σ v   (so the liquid shares add up to exactly V, the volume pumped to waste)
 *   solid j:  V × mⱼ / batch volume, as a mass in g (0 mL: dissolved salts add no volume here).
 * Shares are rounded to 0.0001 mL (the ledger's precision); the largest liquid share takes the
 * rounding remainder so the shares always sum to the rounded channel volume.
 */
import { getReagent } from "../chem/reagents";

export interface CompositionPart {
  reagentId: string;
  unit: "mL" | "g";
  /** Amount that went into the batch (the actual amount when recorded, else the target). */
  amount: number;
}

export interface BatchComposition {
  /** The batch's nominal volume, mL. */
  volume_mL: number;
  parts: readonly CompositionPart[];
}

export interface ReagentShare {
  reagentId: string;
  volume_mL: number;
  /** Grams, for solids; null for liquids. */
  mass_g: number | null;
}

export class CompositionError extends Error {}

const VOLUME_STEPS = 10_000; // 0.0001 mL
const MASS_STEPS = 100_000; // 0.00001 g

export function splitVolume(volume_mL: number, composition: BatchComposition): ReagentShare[] {
  if (!Number.isFinite(volume_mL) || volume_mL < 0) throw new CompositionError(`volume must be a non-negative number, got ${volume_mL}`);
  const liquids = new Map<string, number>();
  const solids = new Map<string, number>();
  for (const part of composition.parts) {
    if (!(part.amount >= 0)) throw new CompositionError(`${part.reagentId}: amount must be non-negative`);
    const into = part.unit === "mL" ? liquids : solids;
    into.set(part.reagentId, (into.get(part.reagentId) ?? 0) + part.amount);
  }
  const liquidTotal = [...liquids.values()].reduce((a, b) => a + b, 0);
  if (liquidTotal <= 0) throw new CompositionError("the batch has no liquid component to split the volume over");
  if (solids.size > 0 && !(composition.volume_mL > 0)) throw new CompositionError("the batch volume must be positive to split its solids");

  const target = Math.round(volume_mL * VOLUME_STEPS);
  const shares: ReagentShare[] = [];
  let assigned = 0;
  let largest = -1;
  for (const [reagentId, amount] of liquids) {
    const steps = Math.round((volume_mL * amount * VOLUME_STEPS) / liquidTotal);
    assigned += steps;
    shares.push({ reagentId, volume_mL: steps, mass_g: null });
    if (largest < 0 || amount > (liquids.get(shares[largest]!.reagentId) ?? 0)) largest = shares.length - 1;
  }
  shares[largest]!.volume_mL += target - assigned;
  for (const share of shares) share.volume_mL /= VOLUME_STEPS;
  for (const [reagentId, grams] of solids) {
    shares.push({ reagentId, volume_mL: 0, mass_g: Math.round((volume_mL * grams * MASS_STEPS) / composition.volume_mL) / MASS_STEPS });
  }
  return shares;
}

/** The waste stream a reagent's share goes to, from the chemistry catalogue; null for a reagent it does not know. */
export function wasteStreamOf(reagentId: string): string | null {
  return getReagent(reagentId)?.wasteStream.value ?? null;
}

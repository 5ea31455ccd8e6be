/**
 * A batch's composition when its components were not recorded one by one: worked out from the
 * recipe specification it was made from, with the chemistry library (pure).
 */
import { designBuffer, mixMobilePhase, type AdditiveUnit } from "../chem";
import { CompositionError, type BatchComposition, type CompositionPart } from "./split";

interface SpecLike {
  solvents?: { reagent: string; percent: number }[];
  additives?: { reagent: string; amount: number; unit: AdditiveUnit }[];
  buffer?: { reagents: string[]; targetPH: number; concentration_mM: number; basis: "first" | "total"; temperature_C?: number };
}

export function compositionFromSpec(spec: unknown, volume_mL: number): BatchComposition {
  const s = (spec ?? {}) as SpecLike;
  if (!Array.isArray(s.solvents) || s.solvents.length === 0) throw new CompositionError("the recipe specification names no solvents");
  const parts: CompositionPart[] = [];
  const add = (reagentId: string, c: { volume_mL?: number | undefined; mass_g?: number | undefined }) => {
    if (c.volume_mL !== undefined) parts.push({ reagentId, unit: "mL", amount: c.volume_mL });
    else if (c.mass_g !== undefined) parts.push({ reagentId, unit: "g", amount: c.mass_g });
  };
  const mix = mixMobilePhase({ total_mL: volume_mL, solvents: s.solvents, additives: s.additives ?? [] });
  for (const c of mix.components) add(c.reagent, c);
  if (s.buffer) {
    const buffer = designBuffer({ ...s.buffer, volume_mL });
    for (const c of buffer.components) add(c.reagent, c);
  }
  return { volume_mL, parts };
}

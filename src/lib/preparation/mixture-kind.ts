/**
 * Which row of the expiry table a mobile phase falls under, from what is in the bottle. Needs the
 * reagent catalogue (is an additive a solid salt?), so it lives apart from the rules themselves.
 */
import { getReagent } from "../chem/reagents";
import type { RecipeSpec } from "../schemas/recipes";
import type { MixtureKind } from "./expiry";

/** Reagents that degrade or evaporate fast enough to set a short shelf life (common practice). */
export const LABILE_REAGENTS = new Set(["ammonium-bicarbonate", "ammonia-solution", "sodium-bicarbonate", "sodium-carbonate"]);

export function mixtureKind(spec: Pick<RecipeSpec, "solvents" | "buffer" | "additives" | "labile">): MixtureKind {
  const ids = [...(spec.buffer?.reagents ?? []), ...(spec.additives ?? []).map((a) => a.reagent)];
  if (spec.labile || ids.some((id) => LABILE_REAGENTS.has(id))) return "labile-additive";
  const water = spec.solvents.filter((s) => s.reagent === "water").reduce((a, s) => a + s.percent, 0);
  const organic = 100 - water;
  if (water <= 0) return "neat-organic";
  if (organic > 0) return "aqueous-organic";
  const salt =
    Boolean(spec.buffer) ||
    (spec.additives ?? []).some((a) => {
      const r = getReagent(a.reagent);
      return r !== undefined && r.form === "solid";
    });
  return salt ? "aqueous-buffer" : "aqueous-acidified";
}

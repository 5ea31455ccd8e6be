/**
 * The pH of a recipe's mobile phase: the aqueous part as it is set (w_w pH) and the mix the column
 * sees (s_s and s_w pH, `mobilePhasePH`), for the recipe and batch pages. Pure; amounts come from the
 * same chemistry as the preparation plan, per litre (pH does not depend on the batch size or on the
 * lots' assays, which change what is weighed, not what is in the bottle).
 */
import { designBuffer } from "../chem/buffer";
import type { ComponentInput } from "../chem/equilibrium";
import { mobilePhaseLimits, mobilePhasePH, type MobilePhasePHResult } from "../chem/hydro-organic";
import { mixMobilePhase } from "../chem/mixing";
import { getReagent } from "../chem/reagents";
import { ChemInputError, type ChemWarning } from "../chem/warnings";
import type { RecipeSpec } from "../schemas/recipes";

export interface MobilePhasePHReport {
  /** Temperature of the aqueous pH (the buffer's, or 25 °C). */
  temperature_C: number;
  organic: { reagent: string; name: string; percent: number } | null;
  result: MobilePhasePHResult | null;
  /** Why nothing could be computed (no water, no acid or base, a ternary mix…). */
  note: string | null;
  warnings: ChemWarning[];
  limits: string[];
}

/** Concentrations in the aqueous part (mol/L) of everything acid–base in the recipe. */
function aqueousComponents(spec: RecipeSpec, water_mL: number): ComponentInput[] {
  const out: ComponentInput[] = [];
  if (spec.buffer) {
    const b = spec.buffer;
    // The buffer's concentration is per litre of the aqueous part (it is made up to volume).
    const d = designBuffer({
      targetPH: b.targetPH,
      volume_mL: 1000,
      reagents: b.reagents,
      concentration_mM: b.concentration_mM,
      basis: b.basis,
      temperature_C: b.temperature_C,
    });
    for (const c of d.components) out.push({ reagent: c.reagent, concentration_mol_L: c.amount_mol });
  }
  const additives = (spec.additives ?? []).filter(
    (a) => (getReagent(a.reagent)?.acidBase.systems.length ?? 0) + (getReagent(a.reagent)?.acidBase.ions.length ?? 0) > 0,
  );
  if (additives.length > 0) {
    // Additives are per litre of the final mix and go into the water first.
    const mix = mixMobilePhase({ total_mL: 1000, solvents: spec.solvents, additives });
    for (const c of mix.components) {
      if (!additives.some((a) => a.reagent === c.reagent)) continue;
      out.push({ reagent: c.reagent, concentration_mol_L: (c.amount_mol ?? 0) / (water_mL / 1000) });
    }
  }
  return out;
}

export function mobilePhasePHReport(spec: RecipeSpec): MobilePhasePHReport {
  const temperature_C = spec.buffer?.temperature_C ?? 25;
  const limits = mobilePhaseLimits();
  const empty = (note: string): MobilePhasePHReport => ({ temperature_C, organic: null, result: null, note, warnings: [], limits });
  const water = spec.solvents.filter((s) => s.reagent === "water").reduce((a, s) => a + s.percent, 0);
  if (water <= 0) return empty("No water in this mobile phase: pH is not defined for it here.");
  const organics = spec.solvents.filter((s) => s.reagent !== "water" && s.percent > 0);
  if (organics.length > 1) return empty("Mixed-solvent pH is modelled for water with one organic solvent; this mix has more.");
  try {
    const aqueous = aqueousComponents(spec, water * 10);
    if (aqueous.length === 0) return empty("No acid, base or buffer in this mobile phase.");
    const o = organics[0];
    const organic = o ? { reagent: o.reagent, name: getReagent(o.reagent)?.name ?? o.reagent, percent: o.percent } : null;
    const result = mobilePhasePH({
      aqueous: { components: aqueous, temperature_C },
      organic: { reagent: o?.reagent ?? "acetonitrile", percent: o?.percent ?? 0 },
    });
    return { temperature_C, organic, result, note: null, warnings: result.warnings, limits };
  } catch (error) {
    if (error instanceof ChemInputError) return empty(`The pH cannot be computed: ${error.message}`);
    throw error;
  }
}

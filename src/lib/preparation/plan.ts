/**
 * From a recipe and a batch size to what a technician weighs and measures, in order. Pure: the
 * same function runs live in the preparation form and again on the server when the batch is
 * recorded, so the stored targets are exactly what the form showed.
 */
import { designBuffer } from "../chem/buffer";
import { mixMobilePhase } from "../chem/mixing";
import { mixtureProperties } from "../chem/mixture-properties";
import type { LotDensities, Purities } from "../chem/lot-assay";
import { getReagent } from "../chem/reagents";
import { orderOfWork } from "./order-of-work";
import { ChemInputError, type ChemWarning } from "../chem/warnings";
import type { RecipeSpec } from "../schemas/recipes";
import type { MixtureKind } from "./expiry";
import { mixtureKind } from "./mixture-kind";

export type ComponentRole = "solvent" | "buffer" | "titrant" | "additive";

export interface PlannedComponent {
  reagent: string;
  name: string;
  role: ComponentRole;
  /** Canonical units: liquids in mL, solids in g. */
  unit: "mL" | "g";
  target: number;
}

export interface PreparationPlan {
  components: PlannedComponent[];
  finalVolume_mL: number;
  /** Volume of the aqueous part (water share of the batch), where a buffer is made. */
  aqueous_mL: number;
  warnings: ChemWarning[];
  properties: { polarityIndex: number; uvCutoff_nm: number; viscosity_cP?: number };
  buffer: { pH: number; ionicStrength_mol_L: number; bufferCapacity_mM_per_pH: number } | null;
  steps: string[];
  cautions: string[];
  kind: MixtureKind;
}

export interface PlanInput {
  spec: RecipeSpec;
  volume_mL: number;
  temperature_C?: number;
  detection_nm?: number | null;
  /** The assay (mass fraction) of the lots picked, by reagent; the catalogue's typical values otherwise. */
  purities?: Purities;
  /** The lots' densities at 20 °C (solutions), by reagent. */
  densities_g_mL?: LotDensities;
}

function nameOf(id: string): string {
  return getReagent(id)?.name ?? id;
}

function pushUnique(list: ChemWarning[], more: readonly ChemWarning[]) {
  for (const w of more) if (!list.some((x) => x.code === w.code && x.reagent === w.reagent)) list.push(w);
}

const HANDLING_CODES = new Set(["flammable", "concentrated-reagent"]);

const lotData = (input: PlanInput) => ({
  ...(input.purities ? { purities: input.purities } : {}),
  ...(input.densities_g_mL ? { densities_g_mL: input.densities_g_mL } : {}),
});

/** Throws ChemInputError (with the field) when the chemistry cannot be computed. */
export function preparationPlan(input: PlanInput): PreparationPlan {
  const { spec } = input;
  const temperature_C = input.temperature_C ?? 25;
  const detection = input.detection_nm ?? undefined;
  if (!(input.volume_mL > 0)) throw new ChemInputError("invalid-input", "The batch volume must be greater than zero.", "volume_mL");
  const warnings: ChemWarning[] = [];
  const components: PlannedComponent[] = [];

  // Additives are per litre of the final mix (mixing.ts), whose volume is also the solvents'
  // contracted volume plus the additives': the volume is linear in the solvents measured, so one
  // probe scales them until the final mix is the batch volume the bottles hold.
  const mixAt = (total_mL: number) =>
    mixMobilePhase({
      total_mL,
      solvents: spec.solvents,
      additives: spec.additives,
      temperature_C,
      ...(detection ? { detectionWavelength_nm: detection } : {}),
      ...lotData(input),
    });
  const probe = mixAt(input.volume_mL);
  const mix = mixAt((input.volume_mL * input.volume_mL) / probe.finalVolume_mL);
  pushUnique(warnings, mix.warnings);
  const waterShare = spec.solvents.filter((s) => s.reagent === "water").reduce((a, s) => a + s.percent, 0);
  const aqueous_mL = mix.components.find((c) => c.reagent === "water")?.volume_mL ?? (waterShare / 100) * input.volume_mL;

  for (const c of mix.components) {
    const isSolvent = spec.solvents.some((s) => s.reagent === c.reagent);
    if (isSolvent) {
      if ((c.volume_mL ?? 0) > 0)
        components.push({ reagent: c.reagent, name: nameOf(c.reagent), role: "solvent", unit: "mL", target: c.volume_mL! });
    } else {
      const unit = c.volume_mL !== undefined ? "mL" : "g";
      components.push({
        reagent: c.reagent,
        name: nameOf(c.reagent),
        role: "additive",
        unit,
        target: unit === "mL" ? c.volume_mL! : c.mass_g!,
      });
    }
  }

  let buffer: PreparationPlan["buffer"] = null;
  if (spec.buffer) {
    const b = spec.buffer;
    const result = designBuffer({
      targetPH: b.targetPH,
      volume_mL: aqueous_mL,
      temperature_C: b.temperature_C,
      reagents: b.reagents,
      concentration_mM: b.concentration_mM,
      basis: b.basis,
      ...(detection ? { detectionWavelength_nm: detection } : {}),
      ...lotData(input),
    });
    pushUnique(warnings, result.warnings);
    buffer = { pH: result.pH, ionicStrength_mol_L: result.ionicStrength_mol_L, bufferCapacity_mM_per_pH: result.bufferCapacity_mM_per_pH };
    result.components.forEach((c, i) => {
      const role: ComponentRole = b.basis === "first" && i === 1 ? "titrant" : "buffer";
      const unit = c.volume_mL !== undefined ? "mL" : "g";
      const target = unit === "mL" ? c.volume_mL! : c.mass_g!;
      if (target > 0) components.push({ reagent: c.reagent, name: nameOf(c.reagent), role, unit, target });
    });
    const organic = 100 - waterShare;
    if (organic > 50) {
      pushUnique(warnings, [
        {
          code: "precipitation-risk",
          message: `A buffer salt in a mix with ${organic} % organic solvent may precipitate in the bottle or at the mixer (common practice; phosphate is the worst): check its solubility first.`,
          reagent: b.reagents[0],
        },
      ]);
    }
  }

  const props = mixtureProperties({ solvents: spec.solvents, temperature_C });
  pushUnique(
    warnings,
    props.warnings.filter((w) => w.code !== "no-viscosity-data"),
  );

  const finalVolume_mL = mix.finalVolume_mL;
  const { steps, cautions } = orderOfWork(components, spec, finalVolume_mL);

  return {
    components,
    // The buffer is made up to the water's volume, so its reagents add no volume of their own.
    finalVolume_mL,
    aqueous_mL,
    // Warnings are about this mix (UV cutoff, precipitation, MS); handling a flammable or a
    // concentrated reagent is in the cautions, once.
    warnings: warnings.filter((w) => !HANDLING_CODES.has(w.code)),
    properties: {
      polarityIndex: props.polarityIndex,
      uvCutoff_nm: props.uvCutoff_nm,
      ...(props.viscosity_cP !== undefined ? { viscosity_cP: props.viscosity_cP } : {}),
    },
    buffer,
    steps,
    cautions,
    kind: mixtureKind(spec),
  };
}

/** Share of each component in the mix (v/v for liquids, w/v for solids), for the hazard summary. */
export function componentShares(
  plan: Pick<PreparationPlan, "components" | "finalVolume_mL">,
): { reagent: string; share_percent: number }[] {
  return plan.components.map((c) => ({ reagent: c.reagent, share_percent: (c.target / plan.finalVolume_mL) * 100 }));
}

/** "Water 70 % + acetonitrile 30 % · formic acid 0.1 % v/v · buffer …" */
export function describeSpec(spec: RecipeSpec): string {
  const solvents = spec.solvents
    .filter((s) => s.percent > 0)
    .map((s) => `${nameOf(s.reagent)} ${+s.percent.toFixed(2)} %`)
    .join(" + ");
  const parts = [solvents];
  if (spec.buffer) {
    const [a, b] = spec.buffer.reagents;
    parts.push(
      `${spec.buffer.concentration_mM} mM ${nameOf(a).toLowerCase()}${spec.buffer.basis === "total" ? ` / ${nameOf(b).toLowerCase()}` : ` with ${nameOf(b).toLowerCase()}`}, pH ${spec.buffer.targetPH.toFixed(2)} at ${spec.buffer.temperature_C} °C (aqueous part)`,
    );
  }
  for (const a of spec.additives ?? []) parts.push(`${nameOf(a.reagent).toLowerCase()} ${a.amount} ${a.unit}`);
  return parts.join(" · ");
}

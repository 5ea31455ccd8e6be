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

const fmtVol = (mL: number) => (mL >= 100 ? `${mL.toFixed(0)} mL` : mL >= 10 ? `${mL.toFixed(1)} mL` : `${mL.toFixed(2)} mL`);

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

  const mix = mixMobilePhase({
    total_mL: input.volume_mL,
    solvents: spec.solvents,
    additives: spec.additives,
    temperature_C,
    ...(detection ? { detectionWavelength_nm: detection } : {}),
    ...lotData(input),
  });
  pushUnique(warnings, mix.warnings);
  const waterShare = spec.solvents.filter((s) => s.reagent === "water").reduce((a, s) => a + s.percent, 0);
  const aqueous_mL = (waterShare / 100) * input.volume_mL;

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

  // Order of work.
  const steps: string[] = [];
  const water = components.find((c) => c.reagent === "water");
  const organics = components.filter((c) => c.role === "solvent" && c.reagent !== "water");
  const solids = components.filter((c) => c.unit === "g");
  const liquidsAdded = components.filter((c) => c.role !== "solvent" && c.unit === "mL");
  if (spec.buffer && water) {
    const first = components.find((c) => c.role === "buffer");
    steps.push(
      `Weigh the buffer salt${solids.length > 1 ? "s" : ""} and dissolve ${solids.length > 1 ? "them" : "it"} in about 80 % of the water (${fmtVol(water.target * 0.8)}).`,
    );
    const titrant = components.find((c) => c.role === "titrant");
    if (titrant) {
      const acidBase = getReagent(titrant.reagent)?.concentrated
        ? ` Add the ${titrant.name.toLowerCase()} slowly to the water, never water to it.`
        : "";
      steps.push(
        `Add the ${titrant.name.toLowerCase()} (about ${titrant.unit === "mL" ? fmtVol(titrant.target) : `${titrant.target.toFixed(3)} g`}), then check the pH at ${spec.buffer.temperature_C} °C and adjust to ${spec.buffer.targetPH.toFixed(2)} with small additions.${acidBase}`,
      );
    } else if (first) {
      steps.push(`Check the pH at ${spec.buffer.temperature_C} °C: it should read ${spec.buffer.targetPH.toFixed(2)}.`);
    }
    steps.push(`Make up to ${fmtVol(water.target)} with water and mix.`);
    if (organics.length)
      steps.push("Set the pH of the aqueous part before any organic solvent is added: the pH reading in a mix is not comparable.");
  } else if (water) {
    steps.push(`Measure ${fmtVol(water.target)} of water in a graduated cylinder.`);
  }
  for (const a of components.filter((c) => c.role === "additive")) {
    const conc = getReagent(a.reagent)?.concentrated;
    steps.push(
      `Add ${a.unit === "mL" ? fmtVol(a.target) : `${a.target.toFixed(3)} g`} of ${a.name.toLowerCase()}${water ? " to the water" : ""}${conc ? ", slowly, in a fume hood: acid (or base) to water, never the reverse" : ""}.`,
    );
  }
  for (const o of organics) steps.push(`Measure ${fmtVol(o.target)} of ${o.name.toLowerCase()} separately, in its own cylinder.`);
  if (organics.length && (water || liquidsAdded.length))
    steps.push(
      "Combine the measured parts and mix; the mix contracts slightly and warms: let it reach room temperature, then degas if your method asks for it.",
    );
  steps.push("Fill and cap the bottles, and label every bottle before it leaves the bench.");

  // Cautions on screen, deferring to the lab's own rules.
  const cautions: string[] = [];
  if (components.some((c) => getReagent(c.reagent)?.flammable))
    cautions.push(
      "Flammable liquids: work in a fume hood away from ignition sources, keep containers closed, and store the bottles in a flammables cabinet.",
    );
  if (components.some((c) => getReagent(c.reagent)?.concentrated))
    cautions.push(
      "Concentrated acid or base: wear eye protection, gloves and a lab coat, work in a fume hood, and add it to water — never water to it.",
    );
  if (organics.length) cautions.push("Organic solvents: wear eye protection and suitable gloves; avoid breathing the vapour.");
  cautions.push("Follow your laboratory's SOPs and local regulations; Decant's figures support them and never replace them.");

  return {
    components,
    // The buffer is made up to the water's volume, so its reagents add no volume of their own.
    finalVolume_mL: mix.finalVolume_mL,
    aqueous_mL,
    warnings,
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

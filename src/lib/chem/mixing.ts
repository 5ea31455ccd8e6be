/**
 * Mobile-phase mixing: solvent volumes, additive amounts and the final volume.
 *
 * Convention (the usual HPLC one, to be stated on screen): solvent
 * percentages are v/v with each solvent measured separately before mixing,
 * so the measured volumes add up to `total_mL` and the mix then contracts a
 * little. Additives are given per litre of the final mix (its estimated
 * volume after contraction). Mass and molar units of an additive refer to the
 * substance itself (H3PO4 for phosphoric acid 85 %); volume units refer to the
 * product as sold.
 */
import { ADDITIVE_UNITS, type AdditiveUnit } from "./additive-units";
import { lookupReagent, validateTemperature } from "./equilibrium";
import { CONTRACTION_TABLES, contractionCoverage, volumeRatio } from "./excess-volume";
import { reagentDensity, reagentPurity, type Reagent } from "./reagents";
import { concentratedWarning, flammableWarning, nonVolatileWarning, uvCutoffWarning } from "./safety";
import { mgToG, mLToL, mMToMolar } from "./units";
import { ChemInputError, type ChemWarning, pushWarning, requireFinite, isList } from "./warnings";
import { waterDensity_g_mL } from "./water";

/** Organic fraction (v/v) above which a buffer salt may precipitate (common practice). */
export const PRECIPITATION_ORGANIC_PERCENT = 50;

export interface SolventShare {
  reagent: string;
  /** Percent v/v, measured separately before mixing. */
  percent: number;
}

export interface MixMobilePhaseInput {
  total_mL: number;
  solvents: readonly SolventShare[];
  additives?: readonly { reagent: string; amount: number; unit: AdditiveUnit }[];
  temperature_C?: number;
  /** Optional: warn about components that absorb above this wavelength. */
  detectionWavelength_nm?: number;
}

export interface MixComponent {
  reagent: string;
  volume_mL?: number;
  mass_g?: number;
  amount_mol?: number;
}

export interface MixMobilePhaseResult {
  components: MixComponent[];
  finalVolume_mL: number;
  warnings: ChemWarning[];
}

/** Estimated volume after mixing separately measured solvent volumes. */
export function mixedVolume(
  volumes: readonly { reagent: Reagent; volume_mL: number }[],
  temperature_C: number,
  warnings: ChemWarning[],
): number {
  const present = volumes.filter((v) => v.volume_mL > 0);
  const ideal = present.reduce((a, v) => a + v.volume_mL, 0);
  if (present.length <= 1) return ideal;
  const water = present.find((v) => v.reagent.id === "water");
  const others = present.filter((v) => v.reagent.id !== "water");
  const organic = others[0];
  const table = organic !== undefined ? CONTRACTION_TABLES[organic.reagent.id] : undefined;
  if (water !== undefined && organic !== undefined && others.length === 1 && table !== undefined) {
    const rhoOrganic = reagentDensity(organic.reagent, temperature_C);
    if (rhoOrganic !== undefined) {
      const mOrganic = organic.volume_mL * rhoOrganic;
      const mWater = water.volume_mL * waterDensity_g_mL(temperature_C);
      const w = mOrganic / (mOrganic + mWater);
      if (contractionCoverage(table, w) === "estimated") {
        pushWarning(warnings, {
          code: "contraction-estimated",
          message: `Volume-of-mixing data for ${organic.reagent.name} + water do not reach this composition: the final volume is an estimate and may be overstated by a little.`,
          reagent: organic.reagent.id,
        });
      }
      return ideal * volumeRatio(table, w);
    }
  }
  const names = present.map((v) => v.reagent.name).join(" + ");
  pushWarning(warnings, {
    code: "no-contraction-data",
    message: `No published volume-of-mixing data are held for ${names}: the final volume assumes ideal mixing and may be overstated by a few percent.`,
  });
  return ideal;
}

function additiveAmount(
  r: Reagent,
  amount: number,
  unit: AdditiveUnit,
  finalVolume_mL: number,
  temperature_C: number,
  field: string,
  warnings: ChemWarning[],
): MixComponent {
  const finalVolume_L = mLToL(finalVolume_mL);
  const M = r.molarMass_g_mol;
  const purity = reagentPurity(r);
  const density = r.form === "liquid" ? reagentDensity(r, temperature_C) : undefined;
  const fromProductVolume = (volume_mL: number): MixComponent => {
    if (r.form !== "liquid")
      throw new ChemInputError(
        "unsupported-unit",
        `${unit} is a volume unit; ${r.name} is a solid, give it in g/L, mg/L, %w/v or mM.`,
        field,
      );
    if (density === undefined)
      throw new ChemInputError("unsupported-unit", `No density is recorded for ${r.name}; give it by mass or in mM.`, field);
    return { reagent: r.id, volume_mL, amount_mol: (volume_mL * density * purity) / M };
  };
  const fromSubstanceMass = (mass_g: number): MixComponent => {
    const amount_mol = mass_g / M;
    const productMass_g = mass_g / purity;
    if (r.form === "liquid") {
      if (density === undefined) {
        pushWarning(warnings, {
          code: "no-density-data",
          message: `No density is recorded for ${r.name}: weigh it instead of measuring a volume.`,
          reagent: r.id,
        });
        return { reagent: r.id, mass_g: productMass_g, amount_mol };
      }
      return { reagent: r.id, volume_mL: productMass_g / density, amount_mol };
    }
    return { reagent: r.id, mass_g: productMass_g, amount_mol };
  };
  switch (unit) {
    case "%v/v":
      return fromProductVolume((amount / 100) * finalVolume_mL);
    case "mL/L":
      return fromProductVolume(amount * finalVolume_L);
    case "%w/v":
      return fromSubstanceMass((amount / 100) * finalVolume_mL);
    case "g/L":
      return fromSubstanceMass(amount * finalVolume_L);
    case "mg/L":
      return fromSubstanceMass(mgToG(amount) * finalVolume_L);
    case "mM":
      return fromSubstanceMass(mMToMolar(amount) * finalVolume_L * M);
    default:
      throw new ChemInputError("unsupported-unit", `Unit "${String(unit)}" is not one of ${ADDITIVE_UNITS.join(", ")}.`, field);
  }
}

/** Recipe for a mobile phase: solvent volumes, additive amounts, final volume and warnings. */
export function mixMobilePhase(input: MixMobilePhaseInput): MixMobilePhaseResult {
  const temperature_C = input.temperature_C ?? 25;
  validateTemperature(temperature_C);
  requireFinite(input.total_mL, "total_mL", { positive: true });
  if (!isList(input.solvents) || input.solvents.length === 0)
    throw new ChemInputError("invalid-input", "solvents must list at least one solvent.", "solvents");
  const warnings: ChemWarning[] = [];
  let sum = 0;
  const volumes: { reagent: Reagent; volume_mL: number }[] = [];
  input.solvents.forEach((s, i) => {
    const field = `solvents[${i}]`;
    const r = lookupReagent(s.reagent, `${field}.reagent`);
    if (r.form !== "liquid")
      throw new ChemInputError("invalid-input", `${r.name} is not a liquid; give it as an additive.`, `${field}.reagent`);
    requireFinite(s.percent, `${field}.percent`, { min: 0 });
    sum += s.percent;
    volumes.push({ reagent: r, volume_mL: (s.percent / 100) * input.total_mL });
  });
  if (Math.abs(sum - 100) > 1e-6)
    throw new ChemInputError("composition-not-100", `Solvent percentages add up to ${sum} %, not 100 %.`, "solvents");

  const solventFinal_mL = mixedVolume(volumes, temperature_C, warnings);
  const organicPercent = input.solvents.reduce((a, s) => a + (s.reagent === "water" ? 0 : s.percent), 0);
  const components: MixComponent[] = volumes.map((v) => ({ reagent: v.reagent.id, volume_mL: v.volume_mL }));
  for (const v of volumes) {
    if (v.volume_mL <= 0) continue;
    flammableWarning(v.reagent, warnings);
    uvCutoffWarning(v.reagent, input.detectionWavelength_nm, warnings);
  }

  let additiveVolume_mL = 0;
  (input.additives ?? []).forEach((a, i) => {
    const field = `additives[${i}]`;
    const r = lookupReagent(a.reagent, `${field}.reagent`);
    requireFinite(a.amount, `${field}.amount`, { min: 0 });
    const c = additiveAmount(r, a.amount, a.unit, solventFinal_mL, temperature_C, `${field}.unit`, warnings);
    additiveVolume_mL += c.volume_mL ?? 0;
    components.push(c);
    concentratedWarning(
      r,
      warnings,
      input.solvents.some((s) => s.reagent === "water" && s.percent > 0),
    );
    flammableWarning(r, warnings);
    nonVolatileWarning(r, warnings);
    uvCutoffWarning(r, input.detectionWavelength_nm, warnings);
    if ((r.role === "salt" || (r.role === "base" && r.form === "solid")) && organicPercent > PRECIPITATION_ORGANIC_PERCENT) {
      pushWarning(warnings, {
        code: "precipitation-risk",
        message: `${r.name} in a mix with ${organicPercent} % organic solvent may precipitate in the bottle or at the mixer (common practice; phosphate is the worst): check its solubility before use.`,
        reagent: r.id,
      });
    }
  });

  return { components, finalVolume_mL: solventFinal_mL + additiveVolume_mL, warnings };
}

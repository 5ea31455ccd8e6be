/**
 * Mobile-phase mixing: solvent volumes, additive amounts and the final volume.
 *
 * Convention (the usual HPLC one, to be stated on screen): solvent
 * percentages are v/v with each solvent measured separately before mixing,
 * so the measured volumes add up to `total_mL` and the mix then contracts a
 * little. Additives are given per litre of the final mix, exactly: the final
 * volume includes the additives' own volume, V = V_solvents / (1 − Σ a) with
 * a the product volume of each liquid additive per mL of the final mix (solids
 * add no volume; at the usual g/L that is under 0.1 %). Mass and molar units
 * of an additive refer to the substance itself (H3PO4 for phosphoric acid
 * 85 %), through the lot's assay when given; volume units refer to the product
 * as sold. Solvent volumes are of the products as sold, whatever their assay.
 */
import { ADDITIVE_UNITS, type AdditiveUnit } from "./additive-units";
import { lookupReagent, validateTemperature } from "./equilibrium";
import { CONTRACTION_TABLES, contractionCoverage, volumeRatio } from "./excess-volume";
import { inLiquidRange } from "./liquid-density";
import { densityOf, purityOf, validateLotData, type LotDensities, type Purities } from "./lot-assay";
import { reagentDensity, type Reagent } from "./reagents";
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
  /** The assay (mass fraction 0–1) of the lot of each additive, by reagent id; the catalogue's typical value otherwise. */
  purities?: Purities;
  /** The lot's density at 20 °C (solutions), by reagent id; the catalogue's otherwise. */
  densities_g_mL?: LotDensities;
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

interface AdditiveLine {
  r: Reagent;
  amount: number;
  unit: AdditiveUnit;
  field: string;
}

/** Product volume of a liquid additive per mL of the final mix (0 for solids and liquids without a density). */
function productVolumePerMl(line: AdditiveLine, purity: number, density: number | undefined): number {
  const { r, amount, unit } = line;
  if (unit === "%v/v") return amount / 100;
  if (unit === "mL/L") return amount / 1000;
  if (r.form !== "liquid" || density === undefined) return 0;
  return substanceGramsPerMl(line) / purity / density;
}

function substanceGramsPerMl({ r, amount, unit }: AdditiveLine): number {
  switch (unit) {
    case "%w/v":
      return amount / 100;
    case "g/L":
      return amount / 1000;
    case "mg/L":
      return mgToG(amount) / 1000;
    case "mM":
      return (mMToMolar(amount) * r.molarMass_g_mol) / 1000;
    default:
      return 0;
  }
}

function additiveAmount(
  line: AdditiveLine,
  finalVolume_mL: number,
  purity: number,
  density: number | undefined,
  warnings: ChemWarning[],
): MixComponent {
  const { r, unit, field } = line;
  const M = r.molarMass_g_mol;
  if (unit === "%v/v" || unit === "mL/L") {
    if (r.form !== "liquid")
      throw new ChemInputError(
        "unsupported-unit",
        `${unit} is a volume unit; ${r.name} is a solid, give it in g/L, mg/L, %w/v or mM.`,
        field,
      );
    if (density === undefined)
      throw new ChemInputError("unsupported-unit", `No density is recorded for ${r.name}; give it by mass or in mM.`, field);
    const volume_mL = productVolumePerMl(line, purity, density) * finalVolume_mL;
    return { reagent: r.id, volume_mL, amount_mol: (volume_mL * density * purity) / M };
  }
  if (!(ADDITIVE_UNITS as readonly string[]).includes(unit))
    throw new ChemInputError("unsupported-unit", `Unit "${String(unit)}" is not one of ${ADDITIVE_UNITS.join(", ")}.`, field);
  const mass_g = substanceGramsPerMl(line) * finalVolume_mL;
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
}

/** Refuses a temperature at which a liquid of the mix is not liquid (below the melting point its density correlation starts at). */
function requireLiquid(r: Reagent, temperature_C: number): void {
  const c = r.densityCorrelation;
  if (c !== undefined && !inLiquidRange(c, temperature_C))
    throw new ChemInputError(
      "invalid-input",
      `${r.name} is not liquid at ${temperature_C} °C (it freezes at ${(c.Tmin_K - 273.15).toFixed(1)} °C): warm the room or the bottle, then measure.`,
      "temperature_C",
    );
}

/** Recipe for a mobile phase: solvent volumes, additive amounts, final volume and warnings. */
export function mixMobilePhase(input: MixMobilePhaseInput): MixMobilePhaseResult {
  const temperature_C = input.temperature_C ?? 25;
  validateTemperature(temperature_C);
  requireFinite(input.total_mL, "total_mL", { positive: true });
  validateLotData(input.purities, input.densities_g_mL);
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
    requireFinite(s.percent, `${field}.percent`, { min: 0, max: 100 });
    if (s.percent > 0) requireLiquid(r, temperature_C);
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

  const lines: AdditiveLine[] = (input.additives ?? []).map((a, i) => {
    const field = `additives[${i}]`;
    const r = lookupReagent(a.reagent, `${field}.reagent`);
    requireFinite(a.amount, `${field}.amount`, { min: 0 });
    if (r.form === "liquid" && a.amount > 0) requireLiquid(r, temperature_C);
    return { r, amount: a.amount, unit: a.unit, field: `${field}.unit` };
  });
  const lotData = lines.map((l) => ({
    purity: purityOf(l.r, input.purities),
    density: l.r.form === "liquid" ? densityOf(l.r, temperature_C, input.purities, input.densities_g_mL, warnings) : undefined,
  }));
  // The additives' own volume is part of the final volume their amounts are given per litre of.
  const additiveShare = lines.reduce((sum, l, i) => sum + productVolumePerMl(l, lotData[i]?.purity ?? 1, lotData[i]?.density), 0);
  if (additiveShare >= 1)
    throw new ChemInputError(
      "invalid-input",
      "The additives would make up the whole volume; give the main liquids as solvents.",
      "additives",
    );
  const finalVolume_mL = solventFinal_mL / (1 - additiveShare);

  lines.forEach((line, i) => {
    const r = line.r;
    components.push(additiveAmount(line, finalVolume_mL, lotData[i]?.purity ?? 1, lotData[i]?.density, warnings));
    concentratedWarning(r, warnings);
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

  return { components, finalVolume_mL, warnings };
}

/**
 * Properties of a solvent mix: Snyder's polarity index P′ weighted by volume
 * fraction, the highest UV cutoff of the components, and the viscosity of
 * water–methanol and water–acetonitrile mixes interpolated (linearly) in the
 * published 25 °C tables. Viscosity is omitted, with a warning, where no
 * table exists for the mix or the temperature.
 */
import { lookupReagent, validateTemperature } from "./equilibrium";
import type { SourceKey } from "./sources";
import { ChemInputError, type ChemWarning, pushWarning, requireFinite, isList } from "./warnings";

export interface ViscosityTable {
  organic: string;
  temperature_C: number;
  /** Viscosity in cP at 0, 10, …, 100 % v/v organic. */
  cP: readonly number[];
  source: SourceKey;
}

/** 25 °C tables, v/v % organic in 10 % steps (check-values §5, [lcqc]). */
export const VISCOSITY_TABLES: Readonly<Record<string, ViscosityTable>> = Object.freeze({
  methanol: {
    organic: "methanol",
    temperature_C: 25,
    source: "lcqc",
    cP: [0.89, 1.18, 1.4, 1.56, 1.62, 1.62, 1.54, 1.36, 1.12, 0.84, 0.56],
  },
  acetonitrile: {
    organic: "acetonitrile",
    temperature_C: 25,
    source: "lcqc",
    cP: [0.89, 1.01, 0.98, 0.98, 0.89, 0.82, 0.72, 0.59, 0.52, 0.46, 0.35],
  },
});

/** How far from the table temperature (°C) a viscosity is still given. */
export const VISCOSITY_TEMPERATURE_TOLERANCE_C = 0.5;

export function interpolateViscosity(table: ViscosityTable, percentOrganic: number): number {
  const x = Math.min(100, Math.max(0, percentOrganic)) / 10;
  const i = Math.min(9, Math.floor(x));
  const a = table.cP[i];
  const b = table.cP[i + 1];
  if (a === undefined || b === undefined) throw new Error("Viscosity table is too short.");
  return a + (b - a) * (x - i);
}

export interface MixturePropertiesInput {
  solvents: readonly { reagent: string; percent: number }[];
  temperature_C?: number;
}

export interface MixturePropertiesResult {
  polarityIndex: number;
  uvCutoff_nm: number;
  viscosity_cP?: number;
  warnings: ChemWarning[];
}

export function mixtureProperties(input: MixturePropertiesInput): MixturePropertiesResult {
  const temperature_C = input.temperature_C ?? 25;
  validateTemperature(temperature_C);
  if (!isList(input.solvents) || input.solvents.length === 0)
    throw new ChemInputError("invalid-input", "solvents must list at least one solvent.", "solvents");
  let sum = 0;
  let polarity = 0;
  let uv = Number.NEGATIVE_INFINITY;
  const present: { id: string; percent: number }[] = [];
  input.solvents.forEach((s, i) => {
    const field = `solvents[${i}]`;
    const r = lookupReagent(s.reagent, `${field}.reagent`);
    requireFinite(s.percent, `${field}.percent`, { min: 0, max: 100 });
    const p = r.polarityIndex?.value;
    if (p === undefined)
      throw new ChemInputError("invalid-input", `${r.name} has no polarity index; it is not a mobile-phase solvent.`, `${field}.reagent`);
    sum += s.percent;
    polarity += (s.percent / 100) * p;
    if (s.percent > 0) {
      uv = Math.max(uv, r.uvCutoff_nm?.value ?? Number.NEGATIVE_INFINITY);
      present.push({ id: r.id, percent: s.percent });
    }
  });
  if (Math.abs(sum - 100) > 1e-6)
    throw new ChemInputError("composition-not-100", `Solvent percentages add up to ${sum} %, not 100 %.`, "solvents");

  const warnings: ChemWarning[] = [];
  const result: MixturePropertiesResult = { polarityIndex: polarity, uvCutoff_nm: uv, warnings };
  const organics = present.filter((p) => p.id !== "water");
  const onlyWater = organics.length === 0;
  const organic = organics[0];
  const table = onlyWater
    ? VISCOSITY_TABLES.methanol
    : organics.length === 1 && organic !== undefined
      ? VISCOSITY_TABLES[organic.id]
      : undefined;
  if (table !== undefined && Math.abs(temperature_C - table.temperature_C) <= VISCOSITY_TEMPERATURE_TOLERANCE_C) {
    result.viscosity_cP = interpolateViscosity(table, organic?.percent ?? 0);
  } else {
    pushWarning(warnings, {
      code: "no-viscosity-data",
      message: `No published viscosity table is held for this mix at ${temperature_C} °C (tables cover water with methanol or acetonitrile at 25 °C).`,
    });
  }
  return result;
}

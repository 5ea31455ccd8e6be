/**
 * Volume change on mixing water with an organic solvent, from published data
 * on the binary mixture. Two kinds of data are held:
 *
 * - density tables: density of the mixture against its mass fraction
 *   (CRC Handbook, concentrative properties of aqueous solutions, 20 °C);
 * - excess molar volumes V^E against the mole fraction of water, where no
 *   density table was found (acetonitrile).
 *
 * Either way the result is the ratio of the real to the ideal volume,
 * V/V_ideal, at the data temperature; it is applied to the ideal volume at the
 * working temperature (the ratio changes little between 20 and 25 °C).
 */
import { molarMass } from "./formula";
import type { SourceKey } from "./sources";
import { waterDensity_g_mL } from "./water";

export interface DensityTable {
  kind: "density";
  organic: string;
  temperature_C: number;
  /** [mass % organic, density g/mL], from 0 to 100 %. */
  rows: readonly (readonly [number, number])[];
  source: SourceKey;
  note?: string;
}

export interface ExcessVolumeTable {
  kind: "excess-molar-volume";
  organic: string;
  /** Formula of the organic component, for its molar mass. */
  organicFormula: string;
  temperature_C: number;
  /** Densities of the pure liquids at the data temperature, g/mL (the ideal-mixing reference). */
  pureDensity_g_mL: { water: number; organic: number };
  densitySource: SourceKey;
  /** Measured [mole fraction of water, V^E in cm³/mol], ascending in mole fraction. */
  rows: readonly (readonly [number, number])[];
  source: SourceKey;
}

export type ContractionTable = DensityTable | ExcessVolumeTable;

/** CRC Handbook 102nd ed., methanol in water, 20 °C (selected rows). */
const METHANOL_20C: DensityTable = {
  kind: "density",
  organic: "methanol",
  temperature_C: 20,
  source: "CRCconc",
  rows: [
    [0, waterDensity_g_mL(20)],
    [5, 0.9896],
    [10, 0.9816],
    [15, 0.974],
    [20, 0.9666],
    [24, 0.9606],
    [28, 0.9545],
    [32, 0.9482],
    [36, 0.9416],
    [40, 0.9347],
    [44, 0.9273],
    [48, 0.9196],
    [52, 0.9114],
    [56, 0.903],
    [60, 0.8944],
    [64, 0.8856],
    [68, 0.8763],
    [72, 0.8667],
    [76, 0.8568],
    [80, 0.8468],
    [84, 0.8365],
    [88, 0.8259],
    [92, 0.8148],
    [96, 0.8034],
    [100, 0.7917],
  ],
};

/** CRC Handbook 102nd ed., ethanol in water, 20 °C (selected rows). */
const ETHANOL_20C: DensityTable = {
  kind: "density",
  organic: "ethanol",
  temperature_C: 20,
  source: "CRCconc",
  rows: [
    [0, waterDensity_g_mL(20)],
    [5, 0.9893],
    [10, 0.9819],
    [15, 0.9752],
    [20, 0.9687],
    [24, 0.9632],
    [28, 0.9571],
    [32, 0.9504],
    [36, 0.9431],
    [40, 0.9352],
    [44, 0.9269],
    [48, 0.9183],
    [52, 0.9095],
    [56, 0.9004],
    [60, 0.8911],
    [64, 0.8818],
    [68, 0.8724],
    [72, 0.8629],
    [76, 0.8533],
    [80, 0.8436],
    [84, 0.8335],
    [88, 0.8232],
    [92, 0.8125],
    [96, 0.8013],
    [100, 0.7893],
  ],
};

/**
 * CRC Handbook 102nd ed., 2-propanol in water, 20 °C (every row the table
 * has). Above 20 % the table steps by 20 %; linear interpolation there is
 * good to about 0.002 g/mL, i.e. 0.2 % of the volume.
 */
const ISOPROPANOL_20C: DensityTable = {
  kind: "density",
  organic: "isopropanol",
  temperature_C: 20,
  source: "CRCconc",
  note: "rows 40–100 % are 20 % apart in the source",
  rows: [
    [0, waterDensity_g_mL(20)],
    [1, 0.996],
    [2, 0.9939],
    [3, 0.992],
    [4, 0.9902],
    [5, 0.9884],
    [6, 0.9871],
    [7, 0.9855],
    [8, 0.9843],
    [9, 0.9831],
    [10, 0.9816],
    [12, 0.9793],
    [14, 0.9772],
    [16, 0.9751],
    [18, 0.9725],
    [20, 0.9696],
    [40, 0.9302],
    [60, 0.8824],
    [80, 0.8341],
    [100, 0.7848],
  ],
};

/**
 * Acetonitrile + water, 298.15 K: the six V^E points of the binary in
 * Fluid Phase Equilib. (2012), doi:10.1016/j.fluid.2011.09.016, as held in
 * NIST ThermoML. They span x(water) 0.597–0.899, about 25–66 % acetonitrile
 * by volume; V^E < 0 over the whole range (Zarei et al. 2008).
 */
const ACETONITRILE_25C: ExcessVolumeTable = {
  kind: "excess-molar-volume",
  organic: "acetonitrile",
  organicFormula: "CH3CN",
  temperature_C: 25,
  pureDensity_g_mL: { water: waterDensity_g_mL(25), organic: 0.7768 },
  densitySource: "ThermoMLjct06",
  source: "ThermoMLfpe12",
  rows: [
    [0.597, -0.561],
    [0.651, -0.581],
    [0.708, -0.566],
    [0.757, -0.558],
    [0.854, -0.489],
    [0.899, -0.413],
  ],
};

export const CONTRACTION_TABLES: Readonly<Record<string, ContractionTable>> = Object.freeze({
  methanol: METHANOL_20C,
  ethanol: ETHANOL_20C,
  isopropanol: ISOPROPANOL_20C,
  acetonitrile: ACETONITRILE_25C,
});

/** Linear interpolation in sorted [x, y] rows; x is clamped to the rows' range. */
function interpolate(rows: readonly (readonly [number, number])[], x: number): number {
  const first = rows[0];
  const last = rows[rows.length - 1];
  if (first === undefined || last === undefined) throw new Error("Empty table.");
  if (x <= first[0]) return first[1];
  for (let k = 1; k < rows.length; k++) {
    const a = rows[k - 1];
    const b = rows[k];
    if (a === undefined || b === undefined) break;
    if (x <= b[0]) return a[1] + ((b[1] - a[1]) * (x - a[0])) / (b[0] - a[0]);
  }
  return last[1];
}

/** Density of the mixture at the table temperature, linear in mass fraction between rows. */
export function tableDensity(table: DensityTable, massFractionOrganic: number): number {
  return interpolate(table.rows, Math.min(100, Math.max(0, massFractionOrganic * 100)));
}

/**
 * V^E (cm³/mol) at a mole fraction of water. Between the measured points it is
 * linear; beyond them it runs linearly to V^E = 0 at the pure liquids, which
 * holds by definition. Only the water-rich end (x ≥ 0.899, a short step to the
 * exact limit) is treated as covered; see `contractionCoverage`.
 */
export function excessMolarVolume_cm3_mol(table: ExcessVolumeTable, moleFractionWater: number): number {
  const x = Math.min(1, Math.max(0, moleFractionWater));
  return interpolate([[0, 0], ...table.rows, [1, 0]], x);
}

/** Mole fraction of water in a water–organic mix of the given mass fraction of organic. */
export function moleFractionWater(table: ExcessVolumeTable, massFractionOrganic: number): number {
  const nOrganic = massFractionOrganic / molarMass(table.organicFormula);
  const nWater = (1 - massFractionOrganic) / molarMass("H2O");
  return nWater / (nWater + nOrganic);
}

/** V/V_ideal at the table temperature for a water–organic mix of the given mass fraction of organic. */
export function volumeRatio(table: ContractionTable, massFractionOrganic: number): number {
  const w = Math.min(1, Math.max(0, massFractionOrganic));
  if (table.kind === "density") {
    const rhoWater = table.rows[0]?.[1];
    const rhoOrganic = table.rows[table.rows.length - 1]?.[1];
    if (rhoWater === undefined || rhoOrganic === undefined) throw new Error("Empty contraction table.");
    const idealSpecificVolume = w / rhoOrganic + (1 - w) / rhoWater;
    return 1 / tableDensity(table, w) / idealSpecificVolume;
  }
  // Per gram of mix: ideal volume from the pure densities, excess from V^E × moles.
  const idealVolume_mL = w / table.pureDensity_g_mL.organic + (1 - w) / table.pureDensity_g_mL.water;
  const moles = w / molarMass(table.organicFormula) + (1 - w) / molarMass("H2O");
  return 1 + (moles * excessMolarVolume_cm3_mol(table, moleFractionWater(table, w))) / idealVolume_mL;
}

/**
 * Whether the data cover this composition: 'measured' inside the table (or,
 * for V^E data, between the last point and pure water), 'estimated' where the
 * value is only an interpolation towards the pure organic solvent.
 */
export function contractionCoverage(table: ContractionTable, massFractionOrganic: number): "measured" | "estimated" {
  if (table.kind === "density") return "measured";
  const lowest = table.rows[0]?.[0] ?? 0;
  return moleFractionWater(table, massFractionOrganic) >= lowest - 1e-9 ? "measured" : "estimated";
}

/**
 * Volume change on mixing water with an organic solvent, from published
 * density tables of the binary mixture.
 *
 * The tables give the density of the mixture against its mass fraction at
 * 20 °C (CRC Handbook, concentrative properties of aqueous solutions). From
 * them the ratio of the real to the ideal volume, V/V_ideal, is computed at
 * 20 °C and applied to the ideal volume at the working temperature; the ratio
 * changes little between 20 and 25 °C.
 */
import { waterDensity_g_mL } from './water';
import type { SourceKey } from './sources';

export interface ContractionTable {
  organic: string;
  temperature_C: number;
  /** [mass % organic, density g/mL], from 0 to 100 %. */
  rows: readonly (readonly [number, number])[];
  source: SourceKey;
}

/** CRC Handbook 102nd ed., methanol in water, 20 °C (selected rows). */
const METHANOL_20C: ContractionTable = {
  organic: 'methanol',
  temperature_C: 20,
  source: 'CRCconc',
  rows: [
    [0, waterDensity_g_mL(20)], [5, 0.9896], [10, 0.9816], [15, 0.974], [20, 0.9666], [24, 0.9606], [28, 0.9545],
    [32, 0.9482], [36, 0.9416], [40, 0.9347], [44, 0.9273], [48, 0.9196], [52, 0.9114], [56, 0.903], [60, 0.8944],
    [64, 0.8856], [68, 0.8763], [72, 0.8667], [76, 0.8568], [80, 0.8468], [84, 0.8365], [88, 0.8259], [92, 0.8148],
    [96, 0.8034], [100, 0.7917],
  ],
};

/** CRC Handbook 102nd ed., ethanol in water, 20 °C (selected rows). */
const ETHANOL_20C: ContractionTable = {
  organic: 'ethanol',
  temperature_C: 20,
  source: 'CRCconc',
  rows: [
    [0, waterDensity_g_mL(20)], [5, 0.9893], [10, 0.9819], [15, 0.9752], [20, 0.9687], [24, 0.9632], [28, 0.9571],
    [32, 0.9504], [36, 0.9431], [40, 0.9352], [44, 0.9269], [48, 0.9183], [52, 0.9095], [56, 0.9004], [60, 0.8911],
    [64, 0.8818], [68, 0.8724], [72, 0.8629], [76, 0.8533], [80, 0.8436], [84, 0.8335], [88, 0.8232], [92, 0.8125],
    [96, 0.8013], [100, 0.7893],
  ],
};

export const CONTRACTION_TABLES: Readonly<Record<string, ContractionTable>> = Object.freeze({
  methanol: METHANOL_20C,
  ethanol: ETHANOL_20C,
});

/** Density of the mixture at the table temperature, linear in mass fraction between rows. */
export function tableDensity(table: ContractionTable, massFractionOrganic: number): number {
  const w = Math.min(100, Math.max(0, massFractionOrganic * 100));
  const rows = table.rows;
  for (let k = 1; k < rows.length; k++) {
    const a = rows[k - 1];
    const b = rows[k];
    if (a === undefined || b === undefined) break;
    if (w <= b[0]) return a[1] + ((b[1] - a[1]) * (w - a[0])) / (b[0] - a[0]);
  }
  const last = rows[rows.length - 1];
  if (last === undefined) throw new Error('Empty contraction table.');
  return last[1];
}

/** V/V_ideal at the table temperature for a water–organic mix of the given mass fraction of organic. */
export function volumeRatio(table: ContractionTable, massFractionOrganic: number): number {
  const rhoWater = table.rows[0]?.[1];
  const rhoOrganic = table.rows[table.rows.length - 1]?.[1];
  if (rhoWater === undefined || rhoOrganic === undefined) throw new Error('Empty contraction table.');
  const w = massFractionOrganic;
  const idealSpecificVolume = w / rhoOrganic + (1 - w) / rhoWater;
  return 1 / tableDensity(table, w) / idealSpecificVolume;
}

// One unit per column: a column's volumes are all in mL or all in L, chosen by its largest figure,
// so a reader compares digits rather than units (a year's totals in L, a day's additive in mL).
import { numberFormat } from "../format";

export type VolumeUnit = "mL" | "L";

/** L once any figure in the column reaches a litre, else mL. */
export function volumeUnitFor(values_mL: Iterable<number>): VolumeUnit {
  for (const v of values_mL) if (Math.abs(v) >= 1_000) return "L";
  return "mL";
}

const fixed = (digits: number) => numberFormat("en-GB", { minimumFractionDigits: digits, maximumFractionDigits: digits });

/** A volume in the column's unit, with fixed decimals so the column aligns: mL with one, L with two (7.3 mL, 12.35 L). */
export function formatVolumeIn(mL: number, unit: VolumeUnit): string {
  return unit === "L" ? `${fixed(2).format(mL / 1000)} L` : `${fixed(1).format(mL)} mL`;
}

// One unit per column: a table's volumes are all in mL or all in L, chosen by the column's largest
// figure, so a reader compares digits rather than units (a year's totals in L, a day's in mL).
import { formatNumber } from "../format";

export type VolumeUnit = "mL" | "L";

/** L once any figure in the column reaches 10 L, else mL. */
export function volumeUnitFor(values_mL: Iterable<number>): VolumeUnit {
  for (const v of values_mL) if (Math.abs(v) >= 10_000) return "L";
  return "mL";
}

/** A volume in the column's unit: mL with one decimal, L with two (e.g. 7.3 mL, 12.35 L). */
export function formatVolumeIn(mL: number, unit: VolumeUnit): string {
  return unit === "L" ? `${formatNumber(mL / 1000, 2)} L` : `${formatNumber(mL, 1)} mL`;
}

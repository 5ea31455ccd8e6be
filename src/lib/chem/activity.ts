/**
 * Activity coefficients: the Davies equation (1962 form, 0.3·I) with the
 * Debye–Hückel A constant for the temperature.
 *
 * A(T) is interpolated (piecewise linear) in a table derived from the
 * Pitzer A_phi of Clegg, Rard & Pitzer (1994) as coded in pytzer:
 * A = 3·A_phi/ln 10 on the molal scale. The solver works in mol/L, so the
 * molal A is converted to the molar scale with A_c = A_m / sqrt(ρ_w).
 */
import { waterDensity_g_mL } from "./water";

/** [temperature °C, A (log10, kg^½ mol^−½)] — check-values §3 (D from [CRP94]). */
export const DEBYE_HUCKEL_A_TABLE: readonly (readonly [number, number])[] = Object.freeze([
  [0, 0.4904],
  [20, 0.5058],
  [25, 0.51],
  [37, 0.5212],
  [50, 0.5345],
] as const);

export const A_TABLE_MIN_C = 0;
export const A_TABLE_MAX_C = 50;

/** Debye–Hückel A (log10), molal scale, kg^½ mol^−½. Linear extrapolation outside 0–50 °C. */
export function debyeHuckelA_molal(temperature_C: number): number {
  const tab = DEBYE_HUCKEL_A_TABLE;
  let k = 0;
  while (k < tab.length - 2 && temperature_C > (tab[k + 1]?.[0] ?? Infinity)) k++;
  const lo = tab[k];
  const hi = tab[k + 1];
  if (lo === undefined || hi === undefined) throw new Error("Debye-Hueckel table is too short.");
  return lo[1] + ((hi[1] - lo[1]) * (temperature_C - lo[0])) / (hi[0] - lo[0]);
}

/** Debye–Hückel A (log10), molar scale, L^½ mol^−½. */
export function debyeHuckelA_molar(temperature_C: number): number {
  return debyeHuckelA_molal(temperature_C) / Math.sqrt(waterDensity_g_mL(temperature_C));
}

/** The bracket of the Davies equation, √I/(1+√I) − 0.3·I. */
export function daviesTerm(ionicStrength: number): number {
  const s = Math.sqrt(ionicStrength);
  return s / (1 + s) - 0.3 * ionicStrength;
}

/** log10 γ for an ion of charge z by the Davies equation. */
export function daviesLog10Gamma(z: number, ionicStrength: number, A: number): number {
  return -A * z * z * daviesTerm(ionicStrength);
}

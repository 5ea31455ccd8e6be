/**
 * Properties of water used by the equilibrium solver and the mixing model.
 */
import { celsiusToKelvin } from "./units";

/**
 * Density of air-free water, g/mL, from the formula of Tanaka et al.,
 * Metrologia 38, 301 (2001), valid 0–40 °C:
 * ρ = a5 [1 − (t + a1)² (t + a2) / (a3 (t + a4))], in kg/m³.
 */
export function waterDensity_g_mL(temperature_C: number): number {
  const t = temperature_C;
  const a1 = -3.983035;
  const a2 = 301.797;
  const a3 = 522528.9;
  const a4 = 69.34881;
  const a5 = 999.97495;
  return (a5 * (1 - ((t + a1) * (t + a1) * (t + a2)) / (a3 * (t + a4)))) / 1000;
}

/**
 * pKw on the activity scale, from Harned & Robinson, Trans. Faraday Soc. 36,
 * 973 (1940), as given in Stumm & Morgan (1981): pKw = 4470.99/T − 6.0875 + 0.01706·T. Gives
 * 13.995 at 25 °C; fitted over 0–60 °C.
 */
export function pKw(temperature_C: number): number {
  const T = celsiusToKelvin(temperature_C);
  return 4470.99 / T - 6.0875 + 0.01706 * T;
}

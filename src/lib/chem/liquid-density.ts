/**
 * Density of a liquid against temperature from a published correlation.
 *
 * Organic liquids follow DIPPR equation 105 with the coefficients of Perry's
 * Handbook (Table 2-32): ρ = C1 / C2^(1 + (1 − T/C3)^C4), in mol/m³. The
 * correlation is used for the temperature dependence only; the catalogue's
 * checked value at 25 °C (or 20 °C) anchors it, because the correlation alone
 * is off by up to 0.4 % at room temperature (methanol, THF) while its slope
 * matches the handbook pairs to a few per cent.
 */
import type { SourceKey } from "./sources";
import { celsiusToKelvin } from "./units";

export interface Dippr105 {
  C1: number;
  C2: number;
  C3_K: number;
  C4: number;
  /** The correlation's range: from the melting point up. */
  Tmin_K: number;
  Tmax_K: number;
  source: SourceKey;
}

/** Perry's Table 2-32 coefficients (DIPPR 105), by reagent id. */
export const PERRY_105: Readonly<Record<string, Dippr105>> = Object.freeze({
  acetonitrile: { C1: 1306.4, C2: 0.22597, C3_K: 545.5, C4: 0.28678, Tmin_K: 229.32, Tmax_K: 545.5, source: "Perry105" },
  methanol: { C1: 2326.7, C2: 0.27073, C3_K: 512.5, C4: 0.24713, Tmin_K: 175.47, Tmax_K: 512.5, source: "Perry105" },
  ethanol: { C1: 1628.8, C2: 0.27469, C3_K: 514, C4: 0.23178, Tmin_K: 159.05, Tmax_K: 514, source: "Perry105" },
  isopropanol: { C1: 1179.9, C2: 0.2644, C3_K: 508.3, C4: 0.24653, Tmin_K: 185.26, Tmax_K: 508.3, source: "Perry105" },
  tetrahydrofuran: { C1: 1254.3, C2: 0.28084, C3_K: 540.15, C4: 0.2912, Tmin_K: 164.65, Tmax_K: 540.15, source: "Perry105" },
  "formic-acid": { C1: 1938, C2: 0.24225, C3_K: 588, C4: 0.24435, Tmin_K: 281.45, Tmax_K: 588, source: "Perry105" },
  "acetic-acid": { C1: 1448.6, C2: 0.25892, C3_K: 591.95, C4: 0.2529, Tmin_K: 289.81, Tmax_K: 591.95, source: "Perry105" },
});

/** DIPPR 105 molar density, mol/m³. */
export function dippr105_mol_m3(c: Dippr105, temperature_K: number): number {
  return c.C1 / c.C2 ** (1 + (1 - temperature_K / c.C3_K) ** c.C4);
}

/** ρ(T) = ρ(anchor) · ρ105(T) / ρ105(anchor). */
export function anchoredDensity(c: Dippr105, anchor: { temperature_C: number; value_g_mL: number }, temperature_C: number): number {
  const ratio = dippr105_mol_m3(c, celsiusToKelvin(temperature_C)) / dippr105_mol_m3(c, celsiusToKelvin(anchor.temperature_C));
  return anchor.value_g_mL * ratio;
}

/** Whether the correlation covers the temperature (a liquid between its melting and critical points). */
export function inLiquidRange(c: Dippr105, temperature_C: number): boolean {
  const T = celsiusToKelvin(temperature_C);
  return T >= c.Tmin_K && T <= c.Tmax_K;
}

/**
 * Unit conversions for the chemistry library, all through `convert-units`
 * (no hand-written factor tables). Factors that the hot paths need are read
 * from `convert-units` once, when the module loads, so that a pH solve does
 * not pay for a conversion call.
 */
import convert from "convert-units";

/** Kelvin at 0 °C, as `convert-units` defines it (273.15). */
export const ZERO_CELSIUS_K: number = convert(0).from("C").to("K");

/** Millilitres in one litre. */
export const ML_PER_L: number = convert(1).from("l").to("ml");

/** Grams in one milligram. */
export const G_PER_MG: number = convert(1).from("mg").to("g");

export function celsiusToKelvin(temperature_C: number): number {
  return temperature_C + ZERO_CELSIUS_K;
}

export function mLToL(volume_mL: number): number {
  return convert(volume_mL).from("ml").to("l");
}

export function lToML(volume_L: number): number {
  return convert(volume_L).from("l").to("ml");
}

export function mgToG(mass_mg: number): number {
  return convert(mass_mg).from("mg").to("g");
}

/** mmol/L to mol/L: the same factor as mL to L (milli- prefix). */
export function mMToMolar(concentration_mM: number): number {
  return convert(concentration_mM).from("ml").to("l");
}

export function molarToMM(concentration_mol_L: number): number {
  return convert(concentration_mol_L).from("l").to("ml");
}

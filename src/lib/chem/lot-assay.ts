/**
 * What is weighed matches what is in the bottle: the assay of the lot actually used (mass fraction
 * of the formula substance, from its certificate of analysis) and, for solutions, its density.
 * `designBuffer` and `mixMobilePhase` take them as `purities` and `densities_g_mL`, keyed by
 * reagent id; without them the catalogue's typical values apply.
 */
import { reagentDensity, reagentPurity, type Reagent } from "./reagents";
import { ChemInputError, type ChemWarning, pushWarning } from "./warnings";

/** Mass fraction 0–1 of the formula substance, by reagent id (the lot's assay). */
export type Purities = Readonly<Record<string, number>>;
/** Density of the lot at 20 °C, g/mL, by reagent id (from its certificate of analysis). */
export type LotDensities = Readonly<Record<string, number>>;

/** Certificates state the density at 20 °C; it is carried to the working temperature with the catalogue's slope. */
export const LOT_DENSITY_TEMPERATURE_C = 20;

/** Refuses purities outside (0, 1] and densities outside 0.5–2.5 g/mL, naming the field. */
export function validateLotData(purities: Purities | undefined, densities: LotDensities | undefined): void {
  for (const [id, p] of Object.entries(purities ?? {})) {
    if (typeof p !== "number" || !Number.isFinite(p) || !(p > 0) || p > 1)
      throw new ChemInputError("invalid-input", `The assay of ${id} must be a mass fraction above 0 and at most 1.`, `purities.${id}`);
  }
  for (const [id, d] of Object.entries(densities ?? {})) {
    if (typeof d !== "number" || !Number.isFinite(d) || d < 0.5 || d > 2.5)
      throw new ChemInputError("invalid-input", `The density of ${id} must be between 0.5 and 2.5 g/mL.`, `densities_g_mL.${id}`);
  }
}

/** The reagent's mass fraction: the lot's when given, else the catalogue's typical value. */
export function purityOf(r: Reagent, purities: Purities | undefined): number {
  return reagentPurity(r, purities?.[r.id]);
}

/**
 * Density of the product at the temperature: the lot's (given at 20 °C, carried with the catalogue's
 * temperature slope) or the catalogue's. A solution whose lot assay differs from the catalogue's
 * product but has no density of its own gets a warning: the volume then uses the catalogue's density.
 */
export function densityOf(
  r: Reagent,
  temperature_C: number,
  purities: Purities | undefined,
  densities: LotDensities | undefined,
  warnings: ChemWarning[],
): number | undefined {
  const catalogue = reagentDensity(r, temperature_C);
  const lot = densities?.[r.id];
  if (lot !== undefined) {
    const at20 = reagentDensity(r, LOT_DENSITY_TEMPERATURE_C);
    return catalogue !== undefined && at20 !== undefined ? (lot * catalogue) / at20 : lot;
  }
  const typical = r.purity_w_w?.value;
  const assay = purities?.[r.id];
  if (r.form === "liquid" && typical !== undefined && assay !== undefined && Math.abs(assay - typical) > 0.005) {
    pushWarning(warnings, {
      code: "lot-density-assumed",
      message: `The lot of ${r.name} assays ${(assay * 100).toFixed(1)} % but no density is recorded for it: the volume uses the density of the ${(typical * 100).toFixed(0)} % product, which may be off by about 1 %. Record the density from the certificate, or weigh it.`,
      reagent: r.id,
    });
  }
  return catalogue;
}

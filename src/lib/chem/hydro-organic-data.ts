/**
 * Data for the pH of hydro-organic mobile phases (`hydro-organic.ts`), at 25 °C, against the volume
 * fraction φ of organic solvent (the volumes measured separately before mixing, as the mobile phase
 * is made and as Rosés, Bosch and co-workers give their compositions).
 *
 * - pKa shifts, s_s pKa − w_w pKa, by the charge type of the acid form of each step: neutral or
 *   anionic acids (HA, HA⁻, HA²⁻: their pKa rise as the solvent becomes less polar) and cationic
 *   acids (NH₄⁺: their pKa fall slightly). From memory of the tables of Espinosa et al. 2002
 *   (acetonitrile) and Bosch et al. 1996 (methanol), not yet checked (`RBshift` in sources.ts); in
 *   acetonitrile the anionic shift is set so that the KHP reference values of Mussini et al. (C)
 *   come out within 0.03 up to 30 % w/w.
 * - the autoprotolysis constant's shift, s_s pKs − pKw (same source, same caveat);
 * - δ = s_w pH − s_s pH as a function of the mole fraction χ of organic (Espinosa et al., Canals
 *   et al., as given by Kazakevich & LoBrutto 2007, `KLB07`, C);
 * - the organic solvent's relative permittivity, for the Debye–Hückel A of the mix (M).
 */
import type { AcidSystemId } from "./acid-systems";
import type { SourceKey } from "./sources";

export type OrganicModifier = "acetonitrile" | "methanol";

export interface OrganicShiftData {
  organic: OrganicModifier;
  /** Grid of volume fractions, from 0 to the highest the data reach. */
  phi: readonly number[];
  /** s_s pKa − w_w pKa for steps whose acid form is neutral or anionic. */
  anionicShift: readonly number[];
  /** s_s pKa − w_w pKa for steps whose acid form is a cation (NH₄⁺). */
  cationicShift: readonly number[];
  /** s_s pKs − w_w pKw (autoprotolysis). */
  pKsShift: readonly number[];
  /** δ = s_w pH − s_s pH at mole fraction χ of organic. */
  delta: (moleFraction: number) => number;
  /** Relative permittivity of the pure organic at 25 °C (water: WATER_PERMITTIVITY). */
  permittivity: number;
  /** The buffer systems the source studied in this solvent. */
  systems: readonly AcidSystemId[];
  sources: { shifts: SourceKey; delta: SourceKey; permittivity: SourceKey };
}

export const WATER_PERMITTIVITY = 78.36;
/** The temperature of every shift and δ value held. */
export const SHIFT_DATA_TEMPERATURE_C = 25;

const PHI = Object.freeze([0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6]);

export const ORGANIC_SHIFTS: Readonly<Record<OrganicModifier, OrganicShiftData>> = Object.freeze({
  acetonitrile: {
    organic: "acetonitrile",
    phi: PHI,
    anionicShift: [0, 0.26, 0.56, 0.86, 1.18, 1.55, 1.98],
    cationicShift: [0, -0.08, -0.16, -0.24, -0.3, -0.34, -0.36],
    pKsShift: [0, 0.28, 0.58, 0.91, 1.27, 1.68, 2.15],
    delta: (x: number) => 0.03 * x - 3.93 * x * x,
    permittivity: 35.94,
    systems: ["acetate", "formate", "phosphate", "phthalate", "citrate", "ammonium", "trifluoroacetate"],
    sources: { shifts: "RBshift", delta: "KLB07", permittivity: "Permittivity" },
  },
  methanol: {
    organic: "methanol",
    phi: PHI,
    anionicShift: [0, 0.12, 0.26, 0.42, 0.59, 0.79, 1.0],
    cationicShift: [0, -0.05, -0.1, -0.16, -0.22, -0.28, -0.33],
    pKsShift: [0, 0.04, 0.08, 0.14, 0.22, 0.32, 0.46],
    delta: (x: number) => 0.2632 * x + 0.4826 * x * x,
    permittivity: 32.66,
    systems: ["acetate", "formate", "phosphate", "phthalate", "citrate", "ammonium", "trifluoroacetate"],
    sources: { shifts: "RBshift", delta: "KLB07", permittivity: "Permittivity" },
  },
});

/** Linear interpolation on the φ grid (φ inside the grid). */
export function onGrid(phiGrid: readonly number[], values: readonly number[], phi: number): number {
  for (let k = 1; k < phiGrid.length; k++) {
    const a = phiGrid[k - 1] ?? 0;
    const b = phiGrid[k] ?? 0;
    if (phi <= b + 1e-12) return (values[k - 1] ?? 0) + (((values[k] ?? 0) - (values[k - 1] ?? 0)) * (phi - a)) / (b - a);
  }
  return values[values.length - 1] ?? 0;
}

/**
 * Acid–base systems: thermodynamic pKa at 25 °C and I = 0, with the standard
 * enthalpy and heat-capacity change of each dissociation step where published,
 * and the temperature correction (van 't Hoff with ΔCp°).
 */
import type { SourceKey } from "./sources";
import { celsiusToKelvin } from "./units";

export type AcidSystemId =
  | "phosphate"
  | "formate"
  | "acetate"
  | "citrate"
  | "ammonium"
  | "carbonate"
  | "tris"
  | "borate"
  | "phthalate"
  | "tartrate"
  | "trifluoroacetate";

export interface AcidSystem {
  id: AcidSystemId;
  name: string;
  /** Charge of the fully protonated species (0 for H3PO4, +1 for NH4+ and TrisH+). */
  z0: number;
  /** Species from fully protonated to fully deprotonated; one more than the number of steps. */
  species: readonly string[];
  /** Thermodynamic pKa of each step at 25 °C, I = 0. */
  pKa25: readonly number[];
  /** ΔrH° of each step, kJ/mol; null where no value is published in the sources used. */
  dH_kJ_mol: readonly (number | null)[];
  /** ΔrCp° of each step, J/(K·mol); null where not published. */
  dCp_J_K_mol: readonly (number | null)[];
  /** Volatile enough for LC–MS (common practice). */
  volatile: boolean;
  source: { pKa: SourceKey; thermo?: SourceKey; note?: string };
}

const sys = (s: AcidSystem): AcidSystem => Object.freeze(s);

export const ACID_SYSTEMS: Readonly<Record<AcidSystemId, AcidSystem>> = Object.freeze({
  phosphate: sys({
    id: "phosphate",
    name: "phosphoric acid",
    z0: 0,
    species: ["H3PO4", "H2PO4-", "HPO4^2-", "PO4^3-"],
    pKa25: [2.148, 7.198, 12.35],
    dH_kJ_mol: [-8.0, 3.6, 16.0],
    dCp_J_K_mol: [-141, -230, -242],
    volatile: false,
    source: { pKa: "GKL02", thermo: "GKL02", note: "Powell et al. 2005 give 2.14 / 7.20 / 12.37" },
  }),
  formate: sys({
    id: "formate",
    name: "formic acid",
    z0: 0,
    species: ["HCOOH", "HCOO-"],
    pKa25: [3.745],
    dH_kJ_mol: [-0.167],
    dCp_J_K_mol: [null],
    volatile: true,
    source: { pKa: "NIST46", thermo: "NIST46", note: "protonation log K 3.745, ΔH° +0.1674 kJ/mol; CRC lists 3.75 (from memory)" },
  }),
  acetate: sys({
    id: "acetate",
    name: "acetic acid",
    z0: 0,
    species: ["CH3COOH", "CH3COO-"],
    pKa25: [4.756],
    dH_kJ_mol: [-0.41],
    dCp_J_K_mol: [-142],
    volatile: true,
    source: {
      pKa: "Harris",
      thermo: "NIST46",
      note: "NIST 46 gives log K 4.757 and protonation ΔH° +0.41 kJ/mol (so −0.41 for the dissociation); ΔCp° from Goldberg et al. 2002 (from memory)",
    },
  }),
  citrate: sys({
    id: "citrate",
    name: "citric acid",
    z0: 0,
    species: ["H3Cit", "H2Cit-", "HCit^2-", "Cit^3-"],
    pKa25: [3.128, 4.761, 6.396],
    dH_kJ_mol: [4.058, 2.05, -3.347],
    dCp_J_K_mol: [-131, -178, -254],
    volatile: false,
    source: {
      pKa: "NIST46",
      thermo: "NIST46",
      note: "cumulative protonation log K 6.396 / 11.157 / 14.285 with ΔH° 3.347 / 1.297 / −2.761 kJ/mol; Goldberg et al. 2002 give 4.07 / 2.23 / −3.38 (from memory); ΔCp° from Goldberg et al. (from memory)",
    },
  }),
  ammonium: sys({
    id: "ammonium",
    name: "ammonium",
    z0: 1,
    species: ["NH4+", "NH3"],
    pKa25: [9.245],
    dH_kJ_mol: [51.95],
    dCp_J_K_mol: [8],
    volatile: true,
    source: { pKa: "Harris", thermo: "GKL02" },
  }),
  carbonate: sys({
    id: "carbonate",
    name: "carbonic acid",
    z0: 0,
    species: ["H2CO3*", "HCO3-", "CO3^2-"],
    pKa25: [6.352, 10.329],
    dH_kJ_mol: [9.16, 14.6],
    dCp_J_K_mol: [-371, -249],
    volatile: true,
    source: {
      pKa: "NIST46",
      thermo: "NIST46",
      note: "ΔCp° from Goldberg et al. 2002 (from memory), which gives 6.351 / 10.329 and ΔH° 9.15 / 14.70; closed system: loss of CO2 to air is not modelled",
    },
  }),
  tris: sys({
    id: "tris",
    name: "Tris",
    z0: 1,
    species: ["TrisH+", "Tris"],
    pKa25: [8.072],
    dH_kJ_mol: [47.45],
    dCp_J_K_mol: [-59],
    volatile: false,
    source: { pKa: "GKL02", thermo: "GKL02" },
  }),
  borate: sys({
    id: "borate",
    name: "boric acid",
    z0: 0,
    species: ["B(OH)3", "B(OH)4-"],
    pKa25: [9.236],
    dH_kJ_mol: [13.8],
    dCp_J_K_mol: [-240],
    volatile: false,
    source: {
      pKa: "NIST46",
      thermo: "GKL02",
      note: "Goldberg et al. 2002 give 9.237 (from memory); NIST 46 gives ΔH° 13 kJ/mol; polyborates neglected (fine below about 0.025 mol/L boron)",
    },
  }),
  phthalate: sys({
    id: "phthalate",
    name: "phthalic acid",
    z0: 0,
    species: ["H2Phth", "HPhth-", "Phth^2-"],
    pKa25: [2.95, 5.408],
    dH_kJ_mol: [-2.678, -2.176],
    dCp_J_K_mol: [-184, -184],
    volatile: false,
    source: {
      pKa: "NIST46",
      thermo: "NIST46",
      note: "cumulative protonation log K 5.408 / 8.358 with ΔH° 2.1757 / 4.8534 kJ/mol, the pKa of Hamer, Pinching & Acree 1945. ΔCp° is derived, not measured: the sum −367 J/(K·mol) from the curvature of Hamer's KHP equation (pH = 1336.08/T − 5.2678 + 0.016069 T, so ΔCp1 + ΔCp2 ≈ −4·R·ln10·0.016069·T), split equally",
    },
  }),
  tartrate: sys({
    id: "tartrate",
    name: "L-(+)-tartaric acid",
    z0: 0,
    species: ["H2Tart", "HTart-", "Tart^2-"],
    pKa25: [3.036, 4.366],
    dH_kJ_mol: [2.929, -0.753],
    dCp_J_K_mol: [null, null],
    volatile: false,
    source: {
      pKa: "NIST46",
      thermo: "NIST46",
      note: "cumulative protonation log K 4.366 / 7.402 with ΔH° −0.7531 / −3.6819 kJ/mol, the values of Bates & Canham 1951; a study extrapolated from 0.5–3 M NaClO4 gave 3.00 / 4.36 (replaced); no ΔCp° held",
    },
  }),
  trifluoroacetate: sys({
    id: "trifluoroacetate",
    name: "trifluoroacetic acid",
    z0: 0,
    species: ["CF3COOH", "CF3COO-"],
    pKa25: [0.47],
    dH_kJ_mol: [null],
    dCp_J_K_mol: [null],
    volatile: true,
    source: {
      pKa: "Bowden96",
      note: "published values run from about 0.2 to 0.5 (0.23 on an encyclopedia page, Ka 0.65 mol/L by conductivity); at 0.1 % v/v the spread moves the pH by under 0.01",
    },
  }),
});

/** Gas constant, J/(K·mol) (CODATA exact value). */
export const R_J_K_MOL = 8.314462618;
const LN10 = Math.LN10;
const THETA_K = celsiusToKelvin(25);

/**
 * pK at temperature T from pK at θ = 298.15 K (van 't Hoff with constant ΔCp°):
 * pK(T) = pK(θ) + [(ΔH − ΔCp·θ)(1/T − 1/θ) − ΔCp·ln(T/θ)] / (R ln 10).
 * A null ΔH° or ΔCp° counts as zero.
 */
export function pKaAtTemperature(pK25: number, dH_kJ_mol: number | null, dCp_J_K_mol: number | null, temperature_K: number): number {
  const dH = (dH_kJ_mol ?? 0) * 1000;
  const dCp = dCp_J_K_mol ?? 0;
  const T = temperature_K;
  return pK25 + ((dH - dCp * THETA_K) * (1 / T - 1 / THETA_K) - dCp * Math.log(T / THETA_K)) / (R_J_K_MOL * LN10);
}

/** All pKa values of a system at a temperature. */
export function systemPKa(system: AcidSystem, temperature_C: number): number[] {
  const T = celsiusToKelvin(temperature_C);
  return system.pKa25.map((pK, i) => pKaAtTemperature(pK, system.dH_kJ_mol[i] ?? null, system.dCp_J_K_mol[i] ?? null, T));
}

/** Strong (fully dissociated) ions carried by reagents. */
export type StrongIonId = "Na+" | "K+" | "Cl-";
export const STRONG_ION_CHARGE: Readonly<Record<StrongIonId, number>> = Object.freeze({
  "Na+": 1,
  "K+": 1,
  "Cl-": -1,
});

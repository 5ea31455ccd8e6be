/**
 * Warnings that a technician must see, and the error type for input the
 * library cannot compute with. Each warning is a code (stable, for the UI and
 * for tests) plus one plain sentence.
 */

export const WARNING_CODES = [
  /** Target pH more than 1 unit from every pKa of the buffer system: little buffer capacity. */
  "ph-far-from-pka",
  /** Phosphate, citrate, borate, Tris, alkali salts: not volatile, unsuitable for MS detection (common practice). */
  "non-volatile-buffer",
  /** A buffer salt in a mix with more than about 50 % organic solvent: it may precipitate (common practice). */
  "precipitation-risk",
  /** A component absorbs above the detection wavelength. */
  "uv-cutoff",
  /** Ionic strength above the range where the Davies equation is good (about 0.1–0.2 mol/L). */
  "ionic-strength-high",
  /** A concentrated acid or base: add it to water, never water to it. */
  "concentrated-reagent",
  /** A flammable liquid. */
  "flammable",
  /** No published volume-of-mixing data for these solvents: the final volume assumes ideal mixing. */
  "no-contraction-data",
  /** Volume-of-mixing data exist for these solvents, but not at this composition: the contraction is an estimate. */
  "contraction-estimated",
  /** No published viscosity table for this mix at this temperature. */
  "no-viscosity-data",
  /** No density for a liquid reagent: only its mass can be given. */
  "no-density-data",
  /** Another organic modifier or column: peak spacing and order may change (re-check system suitability). */
  "selectivity-change",
  /** A mix near its viscosity maximum (methanol–water near 40–50 %): higher back-pressure. */
  "viscosity-maximum",
  /** Solvents or a buffered phase that may not mix or may separate. */
  "miscibility",
  /** The new solvent cannot reach the eluent strength of the old at this composition. */
  "strength-unreachable",
  /** A conversion or a model used beyond the range it was published for. */
  "relation-extrapolated",
  /** Plate number (L/dp) changes: resolution will change. */
  "resolution-change",
  /** Dwell volume differs, in column volumes: a hold or a delayed injection keeps the gradient's timing. */
  "dwell-correction",
  /** Back-pressure rises: check it against the column's and the system's limits. */
  "pressure-increase",
  /** A channel without a named reagent: its solvent and waste cannot be named. */
  "unnamed-channel",
  /** Material compatibility or stability of a solvent (e.g. THF and PEEK, peroxides). */
  "solvent-handling",
  /** The lot's assay differs from the catalogue's product but no density is recorded for it: the volume uses the catalogue's. */
  "lot-density-assumed",
  /** No published pH-shift data for this organic solvent or this buffer: only the aqueous pH is given. */
  "no-organic-data",
  /** The organic fraction is beyond the range of the pH-shift data: the mixed-solvent pH is not given. */
  "organic-beyond-data",
  /** The pH-shift data are for 25 °C; the mix is at another temperature. */
  "organic-data-temperature",
] as const;

export type WarningCode = (typeof WARNING_CODES)[number];

export interface ChemWarning {
  code: WarningCode;
  /** One plain sentence a technician can act on. */
  message: string;
  /** The reagent the warning is about, when there is one. */
  reagent?: string;
}

export const ERROR_CODES = [
  "unknown-reagent",
  "invalid-input",
  "not-aqueous-solute",
  "composition-not-100",
  "target-unreachable",
  "no-shared-acid-system",
  "unsupported-unit",
] as const;

export type ChemErrorCode = (typeof ERROR_CODES)[number];

/** Input the chemistry cannot work with; `field` names the offending input. */
export class ChemInputError extends Error {
  readonly code: ChemErrorCode;
  readonly field: string | undefined;
  constructor(code: ChemErrorCode, message: string, field?: string) {
    super(message);
    this.name = "ChemInputError";
    this.code = code;
    this.field = field;
  }
}

/** Adds a warning unless one with the same code and reagent is already there. */
export function pushWarning(list: ChemWarning[], warning: ChemWarning): void {
  for (const w of list) {
    if (w.code === warning.code && w.reagent === warning.reagent) return;
  }
  list.push(warning);
}

export function requireFinite(
  value: number,
  field: string,
  { min, max, positive }: { min?: number; max?: number; positive?: boolean } = {},
): void {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new ChemInputError("invalid-input", `${field} must be a finite number.`, field);
  }
  if (positive === true && !(value > 0)) {
    throw new ChemInputError("invalid-input", `${field} must be greater than zero.`, field);
  }
  if (min !== undefined && value < min) {
    throw new ChemInputError("invalid-input", `${field} must be at least ${min}.`, field);
  }
  if (max !== undefined && value > max) {
    throw new ChemInputError("invalid-input", `${field} must be at most ${max}.`, field);
  }
}

/** True for arrays; deliberately not a type guard, so that typed lists keep their element type. */
export function isList(value: unknown): boolean {
  return Array.isArray(value);
}

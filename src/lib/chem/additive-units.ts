/**
 * Units an additive's amount may be given in, per litre of the final mix (`mixMobilePhase`).
 * A module of its own so that schemas and forms can list them without the mixing code.
 */
export const ADDITIVE_UNITS = ["%v/v", "%w/v", "mL/L", "g/L", "mg/L", "mM"] as const;
export type AdditiveUnit = (typeof ADDITIVE_UNITS)[number];

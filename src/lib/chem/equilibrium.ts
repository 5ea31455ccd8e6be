/**
 * Acid–base equilibrium of an aqueous solution: full speciation of every
 * acid–base system (polyprotic included), water autoprotolysis, strong ions,
 * charge balance, and Davies activity coefficients iterated to a
 * self-consistent ionic strength.
 *
 * Conventions: concentrations in mol/L; pH = −log10 a(H+); pKa values are
 * thermodynamic (I = 0) and corrected to the temperature; activity
 * coefficients depend only on charge (Davies), neutral species have γ = 1.
 *
 * The charge balance is solved in pH (i.e. in log[H+]) by Newton's method
 * kept inside a bisection bracket, so it always converges; the ionic strength
 * is updated by fixed-point iteration around it. The inner loop allocates
 * nothing.
 */
import { ACID_SYSTEMS, STRONG_ION_CHARGE, type AcidSystem, type StrongIonId, pKaAtTemperature } from "./acid-systems";
import { A_TABLE_MAX_C, A_TABLE_MIN_C, daviesTerm, debyeHuckelA_molar } from "./activity";
import { getReagent, type Reagent } from "./reagents";
import { celsiusToKelvin, molarToMM } from "./units";
import { ChemInputError, type ChemWarning, pushWarning, requireFinite, isList } from "./warnings";
import { pKw } from "./water";

const LN10 = Math.LN10;
/** Search bracket for the charge balance, in pH units. */
export const PH_MIN = -3;
export const PH_MAX = 17;
/** Above this ionic strength (mol/L) the Davies equation is no longer trustworthy. */
export const IONIC_STRENGTH_LIMIT_MOL_L = 0.2;

export interface CompiledSystem {
  system: AcidSystem;
  /** Total concentration of the system (all its species), mol/L. */
  total: number;
  z0: number;
  n: number;
  /** Thermodynamic Ka at the temperature. */
  K: Float64Array;
  /** Conditional Ka at the current ionic strength. */
  Kc: Float64Array;
}

export interface Problem {
  /** Σ z·c of strong ions, mol/L. */
  strongCharge: number;
  /** Σ z²·c of strong ions, mol/L. */
  strongZ2: number;
  strongIons: Map<StrongIonId, number>;
  systems: CompiledSystem[];
  Kw: number;
  /** Debye–Hückel A, molar scale. */
  A: number;
}

const kCache = new Map<AcidSystemId, { t: number; K: Float64Array }>();
type AcidSystemId = AcidSystem["id"];

/** Thermodynamic Ka of each step at the temperature (cached for the last temperature asked). */
export function kaAt(system: AcidSystem, temperature_C: number): Float64Array {
  const hit = kCache.get(system.id);
  if (hit !== undefined && hit.t === temperature_C) return hit.K;
  const T = celsiusToKelvin(temperature_C);
  const K = new Float64Array(system.pKa25.length);
  for (let j = 0; j < K.length; j++) {
    K[j] = 10 ** -pKaAtTemperature(system.pKa25[j] ?? 0, system.dH_kJ_mol[j] ?? null, system.dCp_J_K_mol[j] ?? null, T);
  }
  kCache.set(system.id, { t: temperature_C, K });
  return K;
}

export function compileSystem(system: AcidSystem, total: number, temperature_C: number): CompiledSystem {
  const K = kaAt(system, temperature_C);
  return { system, total, z0: system.z0, n: K.length, K, Kc: new Float64Array(K.length) };
}

export interface ComponentInput {
  reagent: string;
  concentration_mol_L: number;
}

export function lookupReagent(id: string, field: string): Reagent {
  const r = getReagent(id);
  if (r === undefined) throw new ChemInputError("unknown-reagent", `There is no reagent "${id}" in the catalogue.`, field);
  return r;
}

/** Builds the equilibrium problem for a list of components. */
export function buildProblem(components: readonly ComponentInput[], temperature_C: number): Problem {
  const totals = new Map<AcidSystemId, number>();
  const strongIons = new Map<StrongIonId, number>();
  for (let i = 0; i < components.length; i++) {
    const c = components[i];
    if (c === undefined) continue;
    const field = `components[${i}]`;
    const r = lookupReagent(c.reagent, `${field}.reagent`);
    requireFinite(c.concentration_mol_L, `${field}.concentration_mol_L`, { min: 0 });
    if (r.id === "water") continue;
    if (r.role === "solvent") {
      throw new ChemInputError(
        "not-aqueous-solute",
        `${r.name} is a solvent; the pH model covers aqueous solutions only.`,
        `${field}.reagent`,
      );
    }
    for (const s of r.acidBase.systems) totals.set(s.system.id, (totals.get(s.system.id) ?? 0) + s.count * c.concentration_mol_L);
    for (const ion of r.acidBase.ions) strongIons.set(ion.ion, (strongIons.get(ion.ion) ?? 0) + ion.count * c.concentration_mol_L);
  }
  let strongCharge = 0;
  let strongZ2 = 0;
  for (const [ion, c] of strongIons) {
    const z = STRONG_ION_CHARGE[ion];
    strongCharge += z * c;
    strongZ2 += z * z * c;
  }
  const systems: CompiledSystem[] = [];
  for (const [id, total] of totals) if (total > 0) systems.push(compileSystem(ACID_SYSTEMS[id], total, temperature_C));
  return { strongCharge, strongZ2, strongIons, systems, Kw: 10 ** -pKw(temperature_C), A: debyeHuckelA_molar(temperature_C) };
}

/** γ of a singly charged ion at ionic strength I. */
export function gammaOne(A: number, I: number): number {
  return 10 ** (-A * daviesTerm(I));
}

/** Sets the conditional constants Kc_j = Ka_j·γ(z)/γ(z−1) for γ(±1) = g. */
export function setConditional(systems: readonly CompiledSystem[], g: number): void {
  for (let k = 0; k < systems.length; k++) setConditionalOne(systems[k] as CompiledSystem, g);
}

export function setConditionalOne(s: CompiledSystem, g: number): void {
  for (let j = 0; j < s.n; j++) {
    const za = s.z0 - j;
    s.Kc[j] = (s.K[j] ?? 0) * g ** (2 * za - 1);
  }
}

// Scratch outputs of evaluate(): no allocation in the inner loop.
let evF = 0;
let evD = 0;
let evIon = 0;
let evH = 0;
let evOH = 0;

/**
 * Charge balance at pH x with the current conditional constants.
 * Sets evF (net charge, mol/L), evD (= −df/dpH / ln10), evIon (Σ z²c).
 */
function evaluate(p: Problem, x: number, g: number): void {
  const h = Math.exp(-x * LN10);
  const H = h / g;
  const OH = p.Kw / (h * g);
  let f = p.strongCharge + H - OH;
  let d = H + OH;
  let ion = p.strongZ2 + H + OH;
  const systems = p.systems;
  for (let k = 0; k < systems.length; k++) {
    const s = systems[k] as CompiledSystem;
    let r = 1;
    let sum = 1;
    let s1 = 0;
    let s2 = 0;
    for (let j = 0; j < s.n; j++) {
      r *= (s.Kc[j] ?? 0) / h;
      sum += r;
      s1 += (j + 1) * r;
      s2 += (j + 1) * (j + 1) * r;
    }
    const nbar = s1 / sum;
    const m2 = s2 / sum;
    const v = m2 - nbar * nbar;
    f += s.total * (s.z0 - nbar);
    d += s.total * (v > 0 ? v : 0);
    ion += s.total * (s.z0 * s.z0 - 2 * s.z0 * nbar + m2);
  }
  evF = f;
  evD = d;
  evIon = ion;
  evH = H;
  evOH = OH;
}

/** Solves the charge balance for pH at fixed activity coefficients. */
function solveChargeBalance(p: Problem, g: number, guess: number): number {
  let lo = PH_MIN;
  let hi = PH_MAX;
  let x = guess > lo && guess < hi ? guess : 7;
  for (let it = 0; it < 200; it++) {
    evaluate(p, x, g);
    const f = evF;
    if (f === 0) return x;
    if (f > 0) lo = x;
    else hi = x;
    // f decreases with pH: df/dpH = −ln10·evD < 0.
    let xn = x + f / (LN10 * evD);
    if (!(xn > lo && xn < hi)) xn = 0.5 * (lo + hi);
    if (Math.abs(xn - x) < 1e-12 || hi - lo < 1e-12) return xn;
    x = xn;
  }
  return x;
}

export interface EquilibriumState {
  pH: number;
  ionicStrength_mol_L: number;
  /** γ of a singly charged ion. */
  gamma1: number;
  /** van Slyke buffer capacity at fixed γ, mol/(L·pH). */
  beta_mol_L: number;
  H_mol_L: number;
  OH_mol_L: number;
}

/** Solves the problem: self-consistent ionic strength around the charge balance. */
export function solveEquilibrium(p: Problem, pHGuess = 7): EquilibriumState {
  let I = 0.5 * p.strongZ2;
  let g = gammaOne(p.A, I);
  setConditional(p.systems, g);
  // The charge function is monotonic; check it changes sign inside the bracket.
  evaluate(p, PH_MIN, g);
  if (evF < 0)
    throw new ChemInputError("invalid-input", "The solution is more acidic than pH −3: the model does not cover it.", "components");
  evaluate(p, PH_MAX, g);
  if (evF > 0)
    throw new ChemInputError("invalid-input", "The solution is more basic than pH 17: the model does not cover it.", "components");
  let x = pHGuess;
  for (let it = 0; it < 100; it++) {
    x = solveChargeBalance(p, g, x);
    evaluate(p, x, g);
    const In = 0.5 * evIon;
    const done = Math.abs(In - I) <= 1e-12 + 1e-10 * In;
    I = In;
    g = gammaOne(p.A, I);
    setConditional(p.systems, g);
    if (done) break;
  }
  x = solveChargeBalance(p, g, x);
  evaluate(p, x, g);
  return { pH: x, ionicStrength_mol_L: 0.5 * evIon, gamma1: g, beta_mol_L: LN10 * evD, H_mol_L: evH, OH_mol_L: evOH };
}

/** Per-mole charge and Σz² of a compiled system at activity h (conditional constants already set). */
export function systemMoments(s: CompiledSystem, h: number): { charge: number; z2: number } {
  let r = 1;
  let sum = 1;
  let s1 = 0;
  let s2 = 0;
  for (let j = 0; j < s.n; j++) {
    r *= (s.Kc[j] ?? 0) / h;
    sum += r;
    s1 += (j + 1) * r;
    s2 += (j + 1) * (j + 1) * r;
  }
  const nbar = s1 / sum;
  return { charge: s.z0 - nbar, z2: s.z0 * s.z0 - 2 * s.z0 * nbar + s2 / sum };
}

export interface SpeciesConcentration {
  species: string;
  charge: number;
  concentration_mol_L: number;
}

export function speciesList(p: Problem, state: EquilibriumState): SpeciesConcentration[] {
  const out: SpeciesConcentration[] = [
    { species: "H+", charge: 1, concentration_mol_L: state.H_mol_L },
    { species: "OH-", charge: -1, concentration_mol_L: state.OH_mol_L },
  ];
  for (const [ion, c] of p.strongIons) out.push({ species: ion, charge: STRONG_ION_CHARGE[ion], concentration_mol_L: c });
  const h = 10 ** -state.pH;
  for (const s of p.systems) {
    let r = 1;
    let sum = 1;
    const rs = [1];
    for (let j = 0; j < s.n; j++) {
      r *= (s.Kc[j] ?? 0) / h;
      sum += r;
      rs.push(r);
    }
    for (let i = 0; i <= s.n; i++) {
      out.push({
        species: s.system.species[i] ?? `${s.system.id}[${i}]`,
        charge: s.z0 - i,
        concentration_mol_L: (s.total * (rs[i] ?? 0)) / sum,
      });
    }
  }
  return out;
}

export function ionicStrengthWarning(I: number, warnings: ChemWarning[]): void {
  if (I > IONIC_STRENGTH_LIMIT_MOL_L) {
    pushWarning(warnings, {
      code: "ionic-strength-high",
      message: `Ionic strength ${I.toFixed(3)} mol/L is above the range where the Davies activity model is reliable (about 0.1–0.2 mol/L); measure the pH.`,
    });
  }
}

/**
 * Refuses a temperature outside what the data cover: the Debye–Hückel A table and the
 * temperature corrections of the pKa hold for 0–50 °C.
 */
export function validateTemperature(temperature_C: number, field = "temperature_C"): void {
  requireFinite(temperature_C, field);
  if (temperature_C < A_TABLE_MIN_C || temperature_C > A_TABLE_MAX_C)
    throw new ChemInputError(
      "invalid-input",
      `${field} must be between ${A_TABLE_MIN_C} and ${A_TABLE_MAX_C} °C, the range of the activity and pKa data.`,
      field,
    );
}

export interface SolutionPHInput {
  components: readonly ComponentInput[];
  temperature_C?: number;
}

export interface SolutionPHResult {
  pH: number;
  ionicStrength_mol_L: number;
  bufferCapacity_mM_per_pH: number;
  species: SpeciesConcentration[];
  warnings: ChemWarning[];
}

/** pH, ionic strength, buffer capacity and speciation of an aqueous solution. */
export function solutionPH(input: SolutionPHInput): SolutionPHResult {
  const temperature_C = input.temperature_C ?? 25;
  validateTemperature(temperature_C);
  if (!isList(input.components)) throw new ChemInputError("invalid-input", "components must be a list.", "components");
  const p = buildProblem(input.components, temperature_C);
  const state = solveEquilibrium(p);
  const warnings: ChemWarning[] = [];
  ionicStrengthWarning(state.ionicStrength_mol_L, warnings);
  return {
    pH: state.pH,
    ionicStrength_mol_L: state.ionicStrength_mol_L,
    bufferCapacity_mM_per_pH: molarToMM(state.beta_mol_L),
    species: speciesList(p, state),
    warnings,
  };
}

/**
 * Buffer design: the amounts of two reagents that give a target pH.
 *
 * At a fixed pH and ionic strength the charge balance is linear in the
 * unknown concentration, so the amount is solved directly, and the ionic
 * strength is iterated to self-consistency around it. The result is then fed
 * back through `solutionPH`, whose pH is what is reported.
 */
import {
  type CompiledSystem,
  compileSystem,
  gammaOne,
  lookupReagent,
  setConditionalOne,
  solutionPH,
  systemMoments,
  ionicStrengthWarning,
  validateTemperature,
} from "./equilibrium";
import { STRONG_ION_CHARGE, systemPKa, type AcidSystem } from "./acid-systems";
import { debyeHuckelA_molar } from "./activity";
import { densityOf, purityOf, validateLotData, type LotDensities, type Purities } from "./lot-assay";
import type { Reagent } from "./reagents";
import { concentratedWarning, nonVolatileWarning, uvCutoffWarning } from "./safety";
import { mLToL, mMToMolar, molarToMM } from "./units";
import { ChemInputError, type ChemWarning, isList, pushWarning, requireFinite } from "./warnings";
import { pKw } from "./water";

export type BufferBasis = "first" | "total";

export interface DesignBufferInput {
  targetPH: number;
  volume_mL: number;
  temperature_C?: number;
  /** [first, second]: with basis 'first' the first is fixed and the second solved for. */
  reagents: readonly [string, string] | readonly string[];
  concentration_mM: number;
  /**
   * 'first': the first reagent is at concentration_mM, the second (a conjugate
   * form or a titrant) is solved for. 'total': the acid–base system the two
   * share totals concentration_mM, split between the two forms.
   */
  basis: BufferBasis;
  /** Optional: warn about components that absorb above this wavelength. */
  detectionWavelength_nm?: number;
  /** The assay (mass fraction 0–1) of the lot used, by reagent id; the catalogue's typical value otherwise. */
  purities?: Purities;
  /** The lot's density at 20 °C (solutions), by reagent id; the catalogue's otherwise. */
  densities_g_mL?: LotDensities;
}

export interface BufferComponent {
  reagent: string;
  amount_mol: number;
  concentration_mM: number;
  /** For solids: mass to weigh (as the product, hydrate included). */
  mass_g?: number;
  /** For liquids: volume of the product as sold (through density and w/w purity). */
  volume_mL?: number;
}

export interface DesignBufferResult {
  components: BufferComponent[];
  pH: number;
  ionicStrength_mol_L: number;
  bufferCapacity_mM_per_pH: number;
  warnings: ChemWarning[];
}

interface PerMole {
  reagent: Reagent;
  strongCharge: number;
  strongZ2: number;
  systems: { cs: CompiledSystem; count: number }[];
}

function perMole(r: Reagent, temperature_C: number): PerMole {
  let strongCharge = 0;
  let strongZ2 = 0;
  for (const ion of r.acidBase.ions) {
    const z = STRONG_ION_CHARGE[ion.ion];
    strongCharge += z * ion.count;
    strongZ2 += z * z * ion.count;
  }
  return {
    reagent: r,
    strongCharge,
    strongZ2,
    systems: r.acidBase.systems.map((s) => ({ cs: compileSystem(s.system, 1, temperature_C), count: s.count })),
  };
}

let pmCharge = 0;
let pmZ2 = 0;
function evalPerMole(pm: PerMole, h: number, g: number): void {
  let q = pm.strongCharge;
  let z2 = pm.strongZ2;
  for (const s of pm.systems) {
    setConditionalOne(s.cs, g);
    const m = systemMoments(s.cs, h);
    q += s.count * m.charge;
    z2 += s.count * m.z2;
  }
  pmCharge = q;
  pmZ2 = z2;
}

function sharedSystem(a: Reagent, b: Reagent): { system: AcidSystem; n1: number; n2: number } | undefined {
  for (const sa of a.acidBase.systems) {
    for (const sb of b.acidBase.systems) {
      if (sa.system.id === sb.system.id) return { system: sa.system, n1: sa.count, n2: sb.count };
    }
  }
  return undefined;
}

/** Amount of reagent as a weighable mass or a measurable volume of the product (the lot's assay and density when given). */
export function amountToMeasure(
  r: Reagent,
  amount_mol: number,
  temperature_C: number,
  warnings: ChemWarning[],
  lot: { purities?: Purities | undefined; densities_g_mL?: LotDensities | undefined } = {},
): { mass_g?: number; volume_mL?: number } {
  const productMass_g = (amount_mol * r.molarMass_g_mol) / purityOf(r, lot.purities);
  if (r.form === "solid") return { mass_g: productMass_g };
  const density = densityOf(r, temperature_C, lot.purities, lot.densities_g_mL, warnings);
  if (density === undefined) {
    pushWarning(warnings, {
      code: "no-density-data",
      message: `No density is recorded for ${r.name}: weigh ${productMass_g.toPrecision(4)} g of it instead of measuring a volume.`,
      reagent: r.id,
    });
    return { mass_g: productMass_g };
  }
  return { volume_mL: productMass_g / density };
}

/** Solves for the concentrations (mol/L) of the two reagents. */
function solveConcentrations(
  first: PerMole,
  second: PerMole,
  targetPH: number,
  C: number,
  basis: BufferBasis,
  temperature_C: number,
  shared: { n1: number; n2: number } | undefined,
): [number, number] {
  const A = debyeHuckelA_molar(temperature_C);
  const Kw = 10 ** -pKw(temperature_C);
  const h = 10 ** -targetPH;
  let I = 0;
  let c1 = basis === "first" ? C : 0;
  let c2 = 0;
  for (let it = 0; it < 200; it++) {
    const g = gammaOne(A, I);
    const H = h / g;
    const OH = Kw / (h * g);
    evalPerMole(first, h, g);
    const q1 = pmCharge;
    const i1 = pmZ2;
    evalPerMole(second, h, g);
    const q2 = pmCharge;
    const i2 = pmZ2;
    if (basis === "first") {
      c2 = q2 === 0 ? Number.NaN : -(H - OH + c1 * q1) / q2;
    } else {
      const n1 = shared?.n1 ?? 1;
      const n2 = shared?.n2 ?? 1;
      const denom = q2 - (n2 * q1) / n1;
      c2 = denom === 0 ? Number.NaN : -(H - OH + (C * q1) / n1) / denom;
      c1 = (C - n2 * c2) / n1;
    }
    if (!Number.isFinite(c2)) return [c1, c2];
    const In = 0.5 * (H + OH + Math.max(c1, 0) * i1 + Math.max(c2, 0) * i2);
    if (Math.abs(In - I) <= 1e-13 + 1e-11 * In) break;
    I = In;
  }
  return [c1, c2];
}

function phOf(components: { reagent: string; concentration_mol_L: number }[], temperature_C: number): number {
  return solutionPH({ components, temperature_C }).pH;
}

/** Amounts of two reagents for a buffer at a target pH. */
export function designBuffer(input: DesignBufferInput): DesignBufferResult {
  const temperature_C = input.temperature_C ?? 25;
  validateTemperature(temperature_C);
  requireFinite(input.targetPH, "targetPH");
  if (input.targetPH < 0 || input.targetPH > 14)
    throw new ChemInputError("invalid-input", "targetPH must be between 0 and 14.", "targetPH");
  requireFinite(input.volume_mL, "volume_mL", { positive: true });
  requireFinite(input.concentration_mM, "concentration_mM", { positive: true });
  validateLotData(input.purities, input.densities_g_mL);
  if (input.basis !== "first" && input.basis !== "total")
    throw new ChemInputError("invalid-input", "basis must be 'first' or 'total'.", "basis");
  if (!isList(input.reagents) || input.reagents.length !== 2)
    throw new ChemInputError("invalid-input", "reagents must name exactly two reagents.", "reagents");
  const id1 = String(input.reagents[0]);
  const id2 = String(input.reagents[1]);
  const r1 = lookupReagent(id1, "reagents[0]");
  const r2 = lookupReagent(id2, "reagents[1]");
  for (const [r, f] of [
    [r1, "reagents[0]"],
    [r2, "reagents[1]"],
  ] as const) {
    if (r.role === "solvent") throw new ChemInputError("not-aqueous-solute", `${r.name} is a solvent, not a buffer reagent.`, f);
  }
  if (r1.id === r2.id) throw new ChemInputError("invalid-input", "The two reagents must differ.", "reagents");

  const C = mMToMolar(input.concentration_mM);
  const shared = sharedSystem(r1, r2);
  if (input.basis === "total" && shared === undefined) {
    throw new ChemInputError(
      "no-shared-acid-system",
      `${r1.name} and ${r2.name} share no acid–base system, so basis 'total' has no meaning; use basis 'first'.`,
      "basis",
    );
  }
  const pm1 = perMole(r1, temperature_C);
  const pm2 = perMole(r2, temperature_C);
  const [c1, c2] = solveConcentrations(pm1, pm2, input.targetPH, C, input.basis, temperature_C, shared);

  const tol = 1e-12;
  const upper2 = input.basis === "total" ? C / (shared?.n2 ?? 1) : Number.POSITIVE_INFINITY;
  if (!Number.isFinite(c2) || c2 < -tol || c1 < -tol || c2 > upper2 * (1 + 1e-9)) {
    let reach: string;
    if (input.basis === "first") {
      reach = `${r1.name} alone at ${input.concentration_mM} mM gives pH ${phOf([{ reagent: r1.id, concentration_mol_L: C }], temperature_C).toFixed(2)}, and adding ${r2.name} moves it the other way`;
    } else {
      const a = phOf([{ reagent: r1.id, concentration_mol_L: C / (shared?.n1 ?? 1) }], temperature_C);
      const b = phOf([{ reagent: r2.id, concentration_mol_L: C / (shared?.n2 ?? 1) }], temperature_C);
      reach = `this pair spans pH ${Math.min(a, b).toFixed(2)} to ${Math.max(a, b).toFixed(2)} at ${input.concentration_mM} mM`;
    }
    throw new ChemInputError(
      "target-unreachable",
      `pH ${input.targetPH} cannot be reached with ${r1.name} and ${r2.name}: ${reach}.`,
      "targetPH",
    );
  }
  const conc1 = Math.max(c1, 0);
  const conc2 = Math.max(c2, 0);
  const check = solutionPH({
    components: [
      { reagent: r1.id, concentration_mol_L: conc1 },
      { reagent: r2.id, concentration_mol_L: conc2 },
    ],
    temperature_C,
  });

  const warnings: ChemWarning[] = [];
  const V_L = mLToL(input.volume_mL);
  const components: BufferComponent[] = [
    [r1, conc1],
    [r2, conc2],
  ].map(([r, c]) => {
    const reagent = r as Reagent;
    const amount_mol = (c as number) * V_L;
    return {
      reagent: reagent.id,
      amount_mol,
      concentration_mM: molarToMM(c as number),
      ...amountToMeasure(reagent, amount_mol, temperature_C, warnings, { purities: input.purities, densities_g_mL: input.densities_g_mL }),
    };
  });

  const pKas: number[] = [];
  for (const r of [r1, r2]) for (const s of r.acidBase.systems) pKas.push(...systemPKa(s.system, temperature_C));
  if (pKas.length === 0 || pKas.every((pK) => Math.abs(pK - input.targetPH) > 1)) {
    const list =
      pKas.length > 0
        ? `the nearest pKa is ${pKas.reduce((a, b) => (Math.abs(b - input.targetPH) < Math.abs(a - input.targetPH) ? b : a)).toFixed(2)}`
        : "neither reagent is a weak acid or base";
    pushWarning(warnings, {
      code: "ph-far-from-pka",
      message: `pH ${input.targetPH} is more than 1 unit from every pKa of this buffer (${list}): it has little buffer capacity and the pH will drift.`,
    });
  }
  for (const r of [r1, r2]) {
    nonVolatileWarning(r, warnings);
    concentratedWarning(r, warnings);
    uvCutoffWarning(r, input.detectionWavelength_nm, warnings);
  }
  for (const w of check.warnings) pushWarning(warnings, w);
  ionicStrengthWarning(check.ionicStrength_mol_L, warnings);

  return {
    components,
    pH: check.pH,
    ionicStrength_mol_L: check.ionicStrength_mol_L,
    bufferCapacity_mM_per_pH: check.bufferCapacity_mM_per_pH,
    warnings,
  };
}

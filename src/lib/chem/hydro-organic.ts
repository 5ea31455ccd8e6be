/**
 * The pH the column sees. Chromatographers set the pH of the aqueous buffer (w_w pH) and then add
 * acetonitrile or methanol; the buffer's pKa, the solvent's autoprotolysis and the activity
 * coefficients all change, and so does the pH. Following Rosés, Bosch and co-workers, the pH of the
 * mix on its own scale (s_s pH) is solved from the buffer's pKa in the mix, the mix's
 * autoprotolysis constant and Debye–Hückel activity for the mix's permittivity; the reading of an
 * electrode calibrated with aqueous standards in the mix is s_w pH = s_s pH + δ.
 *
 * What the data cover is stated on screen (`mobilePhaseLimits`): 0–60 % organic by volume, shift
 * data at 25 °C, the buffer systems studied in each solvent; outside, the mixed-solvent pH is not
 * given and a warning says why.
 */
import type { AcidSystemId } from "./acid-systems";
import { debyeHuckelA_molar } from "./activity";
import {
  buildProblem,
  IONIC_STRENGTH_LIMIT_MOL_L,
  lookupReagent,
  solutionPH,
  solveEquilibrium,
  type CompiledSystem,
  type SolutionPHInput,
} from "./equilibrium";
import { onGrid, ORGANIC_SHIFTS, SHIFT_DATA_TEMPERATURE_C, WATER_PERMITTIVITY, type OrganicShiftData } from "./hydro-organic-data";
import { mixedVolume } from "./mixing";
import { reagentDensity } from "./reagents";
import { ChemInputError, type ChemWarning, isList, pushWarning, requireFinite } from "./warnings";
import { pKw } from "./water";

export interface MobilePhasePHInput {
  /** The aqueous part, as `solutionPH` takes it (concentrations of the aqueous buffer before mixing). */
  aqueous: SolutionPHInput;
  /** The organic solvent and its share of the mix, % v/v with each part measured separately. */
  organic: { reagent: string; percent: number };
}

export interface MixedPKa {
  system: AcidSystemId;
  /** Step of the system (0 for the first dissociation). */
  step: number;
  aqueous: number;
  mixed: number;
}

export interface MobilePhasePHResult {
  /** pH of the aqueous buffer (what is set before the organic solvent is added). */
  wwPH: number;
  /** pH of the mix on its own scale (what the ionisation of analytes follows); null where the data do not reach. */
  ssPH: number | null;
  /** pH an electrode calibrated with aqueous standards reads in the mix; null where the data do not reach. */
  swPH: number | null;
  /** δ = s_w pH − s_s pH. */
  delta: number | null;
  pKa: MixedPKa[];
  ionicStrength_mol_L: number | null;
  /** Mole fraction of the organic solvent in the solvent mix. */
  moleFraction: number;
  warnings: ChemWarning[];
}

const WATER_MOLAR_MASS = 18.015;

/** The sentences the screen shows beside any computed pH: the model and the ranges it covers. */
export function aqueousPHLimits(): string[] {
  return [
    "Activity by the Davies equation (0.3·I): against the IUPAC pH standards, which follow the Bates–Guggenheim convention, it differs by up to about 0.01 pH at I ≈ 0.1 mol/L; above I ≈ 0.1–0.2 mol/L it is not reliable.",
    "pKa at 25 °C and I = 0 (NIST 46 and Goldberg et al. 2002), carried to 0–50 °C with ΔH° and ΔCp°; temperatures outside 0–50 °C are refused.",
  ];
}

export function mobilePhaseLimits(): string[] {
  return [
    ...aqueousPHLimits(),
    "Mixed-solvent pH for 0–60 % acetonitrile or methanol by volume, at 25 °C, for acetate, formate, phosphate, phthalate, citrate, ammonium and TFA; pKa shifts by acid charge type after Rosés, Bosch and co-workers. These shift data are not yet checked against the papers: expect ±0.2 pH.",
    "s_w pH = s_s pH + δ (δ from Espinosa et al. and Canals et al.): s_w pH is what an electrode calibrated in aqueous buffers reads in the mix; measure it when the pH matters, following your lab's SOP.",
  ];
}

function stepShift(data: OrganicShiftData, s: CompiledSystem, step: number, phi: number): number {
  const zAcid = s.z0 - step;
  return onGrid(data.phi, zAcid > 0 ? data.cationicShift : data.anionicShift, phi);
}

/** w_w, s_s and s_w pH of a buffered mobile phase made from an aqueous buffer and an organic solvent. */
export function mobilePhasePH(input: MobilePhasePHInput): MobilePhasePHResult {
  if (input.organic === null || typeof input.organic !== "object")
    throw new ChemInputError("invalid-input", "organic must name a solvent and its percent.", "organic");
  requireFinite(input.organic.percent, "organic.percent", { min: 0, max: 100 });
  const organic = lookupReagent(input.organic.reagent, "organic.reagent");
  if (organic.role !== "solvent" || organic.id === "water")
    throw new ChemInputError("invalid-input", `${organic.name} is not an organic solvent.`, "organic.reagent");
  if (!isList(input.aqueous?.components))
    throw new ChemInputError("invalid-input", "aqueous.components must be a list.", "aqueous.components");
  const temperature_C = input.aqueous.temperature_C ?? 25;
  const aqueous = solutionPH(input.aqueous);
  const warnings: ChemWarning[] = [...aqueous.warnings];
  const phi = input.organic.percent / 100;
  const rhoOrganic = reagentDensity(organic, temperature_C) ?? 1;
  const rhoWater = reagentDensity(lookupReagent("water", "water"), temperature_C) ?? 1;
  const nOrganic = (phi * rhoOrganic) / organic.molarMass_g_mol;
  const moleFraction = nOrganic / (nOrganic + ((1 - phi) * rhoWater) / WATER_MOLAR_MASS);
  const result = (ss: number | null, sw: number | null, delta: number | null, pKa: MixedPKa[], I: number | null) => ({
    wwPH: aqueous.pH,
    ssPH: ss,
    swPH: sw,
    delta,
    pKa,
    ionicStrength_mol_L: I,
    moleFraction,
    warnings,
  });
  if (phi === 0) return result(aqueous.pH, aqueous.pH, 0, [], aqueous.ionicStrength_mol_L);

  const data = ORGANIC_SHIFTS[organic.id as keyof typeof ORGANIC_SHIFTS] as OrganicShiftData | undefined;
  if (data === undefined) {
    pushWarning(warnings, {
      code: "no-organic-data",
      message: `No published model of the pH shift is held for ${organic.name}–water: only the aqueous pH is given.`,
      reagent: organic.id,
    });
    return result(null, null, null, [], null);
  }
  const maxPhi = data.phi[data.phi.length - 1] ?? 0;
  if (phi > maxPhi + 1e-12) {
    pushWarning(warnings, {
      code: "organic-beyond-data",
      message: `The pH-shift data for ${organic.name} reach ${maxPhi * 100} % by volume; at ${input.organic.percent} % only the aqueous pH is given.`,
      reagent: organic.id,
    });
    return result(null, null, null, [], null);
  }

  // The aqueous part is diluted by the organic solvent (and the mix contracts a little).
  const V_aq = (1 - phi) * 100;
  const V_mix = mixedVolume(
    [
      { reagent: lookupReagent("water", "water"), volume_mL: V_aq },
      { reagent: organic, volume_mL: phi * 100 },
    ],
    temperature_C,
    warnings,
  );
  const dilution = V_aq / V_mix;
  const problem = buildProblem(
    input.aqueous.components.map((c) => ({ reagent: c.reagent, concentration_mol_L: c.concentration_mol_L * dilution })),
    temperature_C,
  );
  const missing = problem.systems.filter((s) => !data.systems.includes(s.system.id)).map((s) => s.system.name);
  if (missing.length > 0) {
    pushWarning(warnings, {
      code: "no-organic-data",
      message: `No pH-shift data are held for ${missing.join(" and ")} in ${organic.name}–water: only the aqueous pH is given.`,
      reagent: organic.id,
    });
    return result(null, null, null, [], null);
  }
  const pKa: MixedPKa[] = [];
  const systems = problem.systems.map((s) => {
    const K = new Float64Array(s.n);
    for (let j = 0; j < s.n; j++) {
      const aq = -Math.log10(s.K[j] ?? 1);
      const mixed = aq + stepShift(data, s, j, phi);
      K[j] = 10 ** -mixed;
      pKa.push({ system: s.system.id, step: j, aqueous: aq, mixed });
    }
    return { ...s, K, Kc: new Float64Array(s.n) };
  });
  const permittivity = WATER_PERMITTIVITY * (1 - phi) + data.permittivity * phi;
  const state = solveEquilibrium({
    ...problem,
    systems,
    Kw: 10 ** -(pKw(temperature_C) + onGrid(data.phi, data.pKsShift, phi)),
    A: debyeHuckelA_molar(temperature_C) * (WATER_PERMITTIVITY / permittivity) ** 1.5,
  });
  if (Math.abs(temperature_C - SHIFT_DATA_TEMPERATURE_C) > 5) {
    pushWarning(warnings, {
      code: "organic-data-temperature",
      message: `The pH-shift data are for ${SHIFT_DATA_TEMPERATURE_C} °C; at ${temperature_C} °C the mixed-solvent pH is a rougher estimate.`,
    });
  }
  // The activity model holds less far in a solvent of lower permittivity: warn from half the aqueous limit.
  if (state.ionicStrength_mol_L > IONIC_STRENGTH_LIMIT_MOL_L / 2) {
    pushWarning(warnings, {
      code: "ionic-strength-high",
      message: `Ionic strength ${state.ionicStrength_mol_L.toFixed(3)} mol/L in the mix is beyond where the Davies model is reliable in a hydro-organic solvent (about 0.1 mol/L); measure the pH.`,
    });
  }
  const delta = data.delta(moleFraction);
  return result(state.pH, state.pH + delta, delta, pKa, state.ionicStrength_mol_L);
}

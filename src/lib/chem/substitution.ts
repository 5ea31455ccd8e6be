/**
 * Changing the organic modifier of a reversed-phase method (acetonitrile, methanol,
 * tetrahydrofuran, or a blend of them) at the same eluent strength.
 *
 * Relation: the iso-eluotropic binary mixtures of Schoenmakers, Billiet & de Galan (1981),
 * written through the methanol-equivalent fraction φM (0–1):
 *   φ(acetonitrile) = 0.32·φM² + 0.57·φM,   φ(tetrahydrofuran) = 0.66·φM.
 * They were published for φM from 0 to 1 (up to 89 % acetonitrile, 66 % tetrahydrofuran); outside
 * that range a result carries a warning. A blend is made of iso-eluotropic binaries mixed in some
 * ratio, which Schoenmakers et al. found about iso-eluotropic again: a channel holding organic
 * shares f_j needs a total organic fraction of 1 / Σ (f_j / φ_j).
 * Stated accuracy: the relation predicts equal retention only roughly (about ±10 % in k for small
 * molecules); selectivity is not kept at all. Snyder's solvent-strength values (methanol 3.0,
 * acetonitrile 3.2, tetrahydrofuran 4.4) are the linear approximation of the same idea and are
 * used to carry an LSS S value across (`lssStrengthRatio`).
 */
import { interpolateViscosity, VISCOSITY_TABLES } from "./mixture-properties";
import { getReagent } from "./reagents";
import type { ProgramPoint } from "./solvent-use";
import { SOURCES } from "./sources";
import { ChemInputError, type ChemWarning, isList, pushWarning, requireFinite } from "./warnings";

export const ORGANIC_MODIFIERS = ["acetonitrile", "methanol", "tetrahydrofuran"] as const;
export type OrganicModifier = (typeof ORGANIC_MODIFIERS)[number];
/** Percent of each modifier in the organic channel; adds up to 100. */
export type ModifierBlend = Partial<Record<OrganicModifier, number>>;

/** Snyder's reversed-phase solvent strength S (Snyder, Dolan & Gant 1979; SKD10 ch. 6). */
export const SOLVENT_STRENGTH: Readonly<Record<OrganicModifier, number>> = { methanol: 3.0, acetonitrile: 3.2, tetrahydrofuran: 4.4 };

/** Highest %organic a phosphate buffer stays dissolved in (Schellinger & Carr 2004; from memory). */
export const PHOSPHATE_LIMIT_PERCENT: Readonly<Record<OrganicModifier, number>> = { methanol: 80, acetonitrile: 70, tetrahydrofuran: 60 };

export const SUBSTITUTION_RELATION = { name: "Schoenmakers et al. iso-eluotropic mixtures", source: SOURCES.SBG81.citation } as const;

export interface SubstituteSolventInput {
  program: readonly ProgramPoint[];
  /** The organic channel; default B. */
  channel?: string;
  /** The aqueous channel that takes the rest; default A. */
  aqueous?: string;
  from: OrganicModifier;
  to: OrganicModifier | ModifierBlend;
  /** The method's detection wavelength, for the UV cutoff check. */
  detection_nm?: number;
  /** Reagent ids dissolved in the aqueous channel (buffer salts), for the solubility check. */
  aqueousSolutes?: readonly string[];
}

export interface SubstituteSolventResult {
  program: ProgramPoint[];
  /** The new organic channel's blend, normalised to 100. */
  to: ModifierBlend;
  warnings: ChemWarning[];
  relation: typeof SUBSTITUTION_RELATION;
}

const isModifier = (s: string): s is OrganicModifier => (ORGANIC_MODIFIERS as readonly string[]).includes(s);

/** Volume fraction of `modifier` iso-eluotropic with methanol fraction φM. */
export function fromMethanolEquivalent(modifier: OrganicModifier, phiM: number): number {
  if (modifier === "acetonitrile") return 0.32 * phiM * phiM + 0.57 * phiM;
  if (modifier === "tetrahydrofuran") return 0.66 * phiM;
  return phiM;
}

/** The methanol fraction iso-eluotropic with `phi` of `modifier` (the inverse of the above). */
export function toMethanolEquivalent(modifier: OrganicModifier, phi: number): number {
  if (modifier === "acetonitrile") return (-0.57 + Math.sqrt(0.57 * 0.57 + 4 * 0.32 * phi)) / (2 * 0.32);
  if (modifier === "tetrahydrofuran") return phi / 0.66;
  return phi;
}

function normaliseBlend(to: OrganicModifier | ModifierBlend): ModifierBlend {
  if (typeof to === "string") {
    if (!isModifier(to)) throw new ChemInputError("invalid-input", `to: ${to} is not one of ${ORGANIC_MODIFIERS.join(", ")}.`, "to");
    return { [to]: 100 };
  }
  const entries = Object.entries(to ?? {}).filter(([, v]) => v !== undefined && v !== 0);
  let sum = 0;
  for (const [k, v] of entries) {
    if (!isModifier(k)) throw new ChemInputError("invalid-input", `to.${k} is not one of ${ORGANIC_MODIFIERS.join(", ")}.`, `to.${k}`);
    requireFinite(v as number, `to.${k}`, { min: 0 });
    sum += v as number;
  }
  if (entries.length === 0 || Math.abs(sum - 100) > 1e-6)
    throw new ChemInputError("composition-not-100", `The blend adds up to ${sum} %, not 100 %.`, "to");
  return Object.fromEntries(entries) as ModifierBlend;
}

/** Total organic fraction of the blend at the strength of methanol fraction φM. */
export function blendFraction(blend: ModifierBlend, phiM: number): number {
  if (phiM <= 0) return 0;
  let inverse = 0;
  for (const [m, pct] of Object.entries(blend) as [OrganicModifier, number][]) inverse += pct / 100 / fromMethanolEquivalent(m, phiM);
  return 1 / inverse;
}

/** Ratio of Snyder's S of the blend to S of `from`: an LSS S value scales by it (linear approximation). */
export function lssStrengthRatio(from: OrganicModifier, to: OrganicModifier | ModifierBlend): number {
  const blend = normaliseBlend(to);
  let s = 0;
  for (const [m, pct] of Object.entries(blend) as [OrganicModifier, number][]) s += (pct / 100) * SOLVENT_STRENGTH[m];
  return s / SOLVENT_STRENGTH[from];
}

const describeBlend = (blend: ModifierBlend) =>
  Object.entries(blend)
    .map(([m, pct]) => (pct === 100 ? (getReagent(m)?.name ?? m).toLowerCase() : `${pct} % ${(getReagent(m)?.name ?? m).toLowerCase()}`))
    .join(" + ");

/** Converts the organic channel of every program point; the aqueous channel takes the rest. */
export function substituteSolvent(input: SubstituteSolventInput): SubstituteSolventResult {
  const channel = input.channel ?? "B";
  const aqueous = input.aqueous ?? "A";
  if (!isModifier(input.from))
    throw new ChemInputError("invalid-input", `from: ${input.from} is not one of ${ORGANIC_MODIFIERS.join(", ")}.`, "from");
  if (channel === aqueous) throw new ChemInputError("invalid-input", "channel and aqueous must be different channels.", "aqueous");
  if (!isList(input.program) || input.program.length === 0)
    throw new ChemInputError("invalid-input", "program must have at least one point.", "program");
  const blend = normaliseBlend(input.to);
  const warnings: ChemWarning[] = [];
  let extrapolated = false;
  let unreachable = false;

  const program = input.program.map((p, i) => {
    const old = p.composition[channel] ?? 0;
    const water = p.composition[aqueous] ?? 0;
    requireFinite(old, `program[${i}].composition.${channel}`, { min: 0 });
    let phiM = toMethanolEquivalent(input.from, old / 100);
    if (phiM > 1 + 1e-9) extrapolated = true;
    let next = 100 * blendFraction(blend, phiM);
    if (next > old + water + 1e-9) {
      unreachable = true;
      next = old + water;
      phiM = Number.NaN;
    }
    const composition: Record<string, number> = { ...p.composition, [channel]: next, [aqueous]: water + old - next };
    return { time_min: p.time_min, flow_mL_min: p.flow_mL_min, composition };
  });

  const fromName = getReagent(input.from)?.name ?? input.from;
  const toName = describeBlend(blend);
  pushWarning(warnings, {
    code: "selectivity-change",
    message: `Changing ${fromName.toLowerCase()} for ${toName} keeps the eluent strength only approximately and changes selectivity: peaks may move relative to each other or swap order. Run the system-suitability test and re-validate as your quality system requires before using the variant for samples.`,
  });
  if (unreachable)
    pushWarning(warnings, {
      code: "strength-unreachable",
      message: `${toName.charAt(0).toUpperCase()}${toName.slice(1)} cannot match the strength of the strongest points of the program even at 100 % of channel ${channel}: those points are held at the most the channels allow, so late peaks will elute later.`,
    });
  if (extrapolated)
    pushWarning(warnings, {
      code: "relation-extrapolated",
      message: `Some points are stronger than 100 % methanol, beyond the range the iso-eluotropic relation was published for (up to about 89 % acetonitrile or 66 % tetrahydrofuran).`,
    });
  addUvWarning(blend, input.detection_nm, warnings);
  addViscosityWarning(input.from, blend, input.program, program, channel, warnings);
  addBufferWarnings(blend, program, channel, input.aqueousSolutes ?? [], warnings);
  addHandlingWarnings(blend, warnings);
  return { program, to: blend, warnings, relation: SUBSTITUTION_RELATION };
}

function addUvWarning(blend: ModifierBlend, detection_nm: number | undefined, warnings: ChemWarning[]) {
  if (detection_nm === undefined) return;
  for (const m of Object.keys(blend) as OrganicModifier[]) {
    const r = getReagent(m);
    const cutoff = r?.uvCutoff_nm?.value;
    if (!r || cutoff === undefined) continue;
    if (detection_nm <= cutoff)
      pushWarning(warnings, {
        code: "uv-cutoff",
        reagent: m,
        message: `${r.name} absorbs up to about ${cutoff} nm, at or above the method's ${detection_nm} nm: the baseline will be high and drift with the gradient; choose a longer wavelength or keep the old modifier.`,
      });
    else if (detection_nm < cutoff + 10)
      pushWarning(warnings, {
        code: "uv-cutoff",
        reagent: m,
        message: `${r.name}'s UV cutoff (about ${cutoff} nm) is within 10 nm of the method's ${detection_nm} nm: expect more baseline drift across the gradient (common practice).`,
      });
  }
}

/** Highest viscosity (25 °C tables) over the program, sampling each segment. */
function maxViscosity(program: readonly ProgramPoint[], channel: string, organic: string): { cP: number; percent: number } | null {
  const table = VISCOSITY_TABLES[organic];
  if (!table) return null;
  let best = { cP: 0, percent: 0 };
  for (let i = 0; i < program.length; i++) {
    const a = program[i]!.composition[channel] ?? 0;
    const b = (program[i + 1] ?? program[i]!).composition[channel] ?? 0;
    for (let s = 0; s <= 10; s++) {
      const pct = a + ((b - a) * s) / 10;
      const cP = interpolateViscosity(table, pct);
      if (cP > best.cP) best = { cP, percent: pct };
    }
  }
  return best;
}

function addViscosityWarning(
  from: OrganicModifier,
  blend: ModifierBlend,
  before: readonly ProgramPoint[],
  after: readonly ProgramPoint[],
  channel: string,
  warnings: ChemWarning[],
) {
  const only = Object.keys(blend);
  if (only.length !== 1 || only[0] !== "methanol") return;
  const now = maxViscosity(after, channel, "methanol");
  const was = maxViscosity(before, channel, from);
  if (!now || now.cP < 1.3) return;
  const ratio =
    was && was.cP > 0 ? ` about ${(now.cP / was.cP).toFixed(1)} × the back-pressure of the current method` : " a higher back-pressure";
  pushWarning(warnings, {
    code: "viscosity-maximum",
    reagent: "methanol",
    message: `Methanol–water is most viscous near 40–50 % methanol (${now.cP.toFixed(2)} cP at ${now.percent.toFixed(0)} % and 25 °C): expect${ratio} at the same flow. Check it against the column's and the system's pressure limits; a higher column temperature lowers it.`,
  });
}

function addBufferWarnings(
  blend: ModifierBlend,
  program: readonly ProgramPoint[],
  channel: string,
  solutes: readonly string[],
  warnings: ChemWarning[],
) {
  const salts = solutes.map((id) => getReagent(id)).filter((r) => r !== undefined && r.role === "salt" && !r.volatile);
  if (salts.length === 0) return;
  const peak = Math.max(...program.map((p) => p.composition[channel] ?? 0));
  const limit = Math.min(...(Object.keys(blend) as OrganicModifier[]).map((m) => PHOSPHATE_LIMIT_PERCENT[m]));
  if (peak > limit)
    pushWarning(warnings, {
      code: "precipitation-risk",
      message: `The program reaches ${peak.toFixed(0)} % organic; ${salts.map((s) => s!.name).join(", ")} may precipitate above about ${limit} % (Schellinger & Carr 2004, from memory) and block the column or check valves. Test the mix in a vial, or keep the organic below that.`,
    });
  pushWarning(warnings, {
    code: "miscibility",
    message: `Before filling the lines with the new organic solvent, flush buffer salts out of pump, lines and column with water, so no salt meets the neat organic. Salt-containing aqueous phases can separate from organic-rich mixes.`,
  });
}

function addHandlingWarnings(blend: ModifierBlend, warnings: ChemWarning[]) {
  if (blend.tetrahydrofuran)
    pushWarning(warnings, {
      code: "solvent-handling",
      reagent: "tetrahydrofuran",
      message:
        "Tetrahydrofuran forms explosive peroxides on storage (EUH019), is suspected of causing cancer (H351) and swells PEEK tubing and seals: use stabilised HPLC grade with the UV cutoff in mind, date opened bottles, check the system's wetted materials, and follow your SOP.",
    });
  if (blend.methanol)
    pushWarning(warnings, {
      code: "solvent-handling",
      reagent: "methanol",
      message:
        "Methanol is toxic by inhalation, skin contact and ingestion (H301, H311, H331, H370) and flammable: handle it in a fume hood with gloves, and follow your SOP.",
    });
}

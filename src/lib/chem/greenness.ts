/**
 * Greenness of an LC method: the solvent it pumps, the waste it makes by stream, and the HPLC-EAT
 * score (Gaber et al., Green Chem. 13, 2021, 2011):
 *   EAT = Σ over solvents of (S + H + E) · m,
 * with m the mass (g) of the solvent used in one analysis and S, H, E the safety, health and
 * environment indices of the EHS method (Koller, Fischer & Hungerbühler 2000) for that solvent.
 * Inputs: the pump program (so mass per analysis from `solventUse` and the density at 20 °C) and
 * which solvent is on each channel. Lower is greener. Additives and buffer salts at usual
 * concentrations are left out, as in HPLC-EAT; a channel without a named solvent is left out with
 * a warning.
 */
import { getReagent, reagentDensity } from "./reagents";
import { solventUse, type ProgramPoint } from "./solvent-use";
import { SOURCES } from "./sources";
import { type ChemWarning, pushWarning, requireFinite } from "./warnings";

/** EHS indices used by HPLC-EAT (safety 0–4, health 0–2, environment 0–3), source EHS00. */
export const EHS_INDICES: Readonly<Record<string, { S: number; H: number; E: number }>> = {
  water: { S: 0, H: 0, E: 0 },
  acetonitrile: { S: 2.724, H: 1.056, E: 0.772 },
  methanol: { S: 1.912, H: 0.43, E: 0.317 },
  tetrahydrofuran: { S: 1.965, H: 0.99, E: 0.9 },
  ethanol: { S: 1.872, H: 0.204, E: 0.485 },
  isopropanol: { S: 1.874, H: 0.885, E: 0.54 },
};

export const HPLC_EAT = { name: "HPLC-EAT", source: `${SOURCES.Gaber11.citation}; indices: ${SOURCES.EHS00.citation}` } as const;

export interface MethodGreennessInput {
  program: readonly ProgramPoint[];
  injections: number;
  /** The solvent on each channel, by reagent id (e.g. { A: "water", B: "acetonitrile" }). */
  solvents?: Readonly<Record<string, string>>;
}

export interface MethodGreennessResult {
  /** mL by reagent id over all injections; a channel without a solvent is keyed `channel:<X>`. Adds up to solventUse's total. */
  solvents_mL: Record<string, number>;
  /** mL by waste stream (the catalogue's stream of each solvent); `unassigned` for unnamed channels. */
  waste_mL: Record<string, number>;
  score: { name: string; value: number; total: number; source: string; unit: string };
  warnings: ChemWarning[];
}

/** The stream of a channel's solvent, as the ledger records it. */
export function wasteStreamOfSolvent(reagentId: string | undefined): string {
  return (reagentId && getReagent(reagentId)?.wasteStream.value) || "unassigned";
}

export function methodGreenness(input: MethodGreennessInput): MethodGreennessResult {
  requireFinite(input.injections, "injections", { min: 0 });
  const perAnalysis = solventUse({ program: input.program });
  const total = solventUse({ program: input.program, injections: input.injections });
  const solvents = input.solvents ?? {};
  const warnings: ChemWarning[] = [];
  const solvents_mL: Record<string, number> = {};
  const waste_mL: Record<string, number> = {};
  let eat = 0;
  for (const [channel, volume] of Object.entries(total.byChannel_mL)) {
    const reagentId = solvents[channel];
    const key = reagentId ?? `channel:${channel}`;
    solvents_mL[key] = (solvents_mL[key] ?? 0) + volume;
    const stream = wasteStreamOfSolvent(reagentId);
    waste_mL[stream] = (waste_mL[stream] ?? 0) + volume;
    const perOne = perAnalysis.byChannel_mL[channel] ?? 0;
    if (perOne <= 1e-12) continue;
    const reagent = reagentId ? getReagent(reagentId) : undefined;
    const indices = reagentId ? EHS_INDICES[reagentId] : undefined;
    const density = reagent ? reagentDensity(reagent, 20) : undefined;
    if (!reagentId || !reagent) {
      pushWarning(warnings, {
        code: "unnamed-channel",
        message: `No solvent is named for channel ${channel}: its ${perOne.toFixed(2)} mL per injection are left out of the HPLC-EAT score and counted as unassigned waste.`,
      });
    } else if (!indices || density === undefined) {
      pushWarning(warnings, {
        code: "unnamed-channel",
        reagent: reagentId,
        message: `No EHS indices are held for ${reagent.name}: it is left out of the HPLC-EAT score.`,
      });
    } else eat += (indices.S + indices.H + indices.E) * perOne * density;
  }
  return {
    solvents_mL,
    waste_mL,
    score: {
      name: HPLC_EAT.name,
      value: eat,
      total: eat * input.injections,
      source: HPLC_EAT.source,
      unit: "per analysis (lower is greener)",
    },
    warnings,
  };
}

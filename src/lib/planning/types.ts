/** What the planning API answers (wire types, shared by pages, islands and services). */
import type { ProgramPoint } from "../chem/solvent-use";
import type { ChemWarning } from "../chem/warnings";
import type { VariantParams } from "../schemas/planning";
import type { SavingResult } from "./savings";
import type { SupplyState } from "./supply";

export interface GreennessSummary {
  /** Solvent per injection by reagent id, mL. */
  perInjection_mL: Record<string, number>;
  /** Per 100 injections: solvent by reagent, waste by stream, and the cost at today's rates. */
  per100_mL: Record<string, number>;
  waste100_mL: Record<string, number>;
  cost100: { amount: number; currency: string } | null;
  score: { name: string; value: number; source: string; unit: string };
  warnings: ChemWarning[];
}

export interface VariantEvaluation {
  methodId: number;
  /** The solvent on each channel, as the ledger recorded it for this method (or as given). */
  solvents: Record<string, string>;
  solventsFrom: "ledger" | "given" | "assumed";
  program: ProgramPoint[];
  variantSolvents: Record<string, string>;
  injection_uL: number | null;
  transfer: {
    flowFactor: number;
    timeFactor: number;
    hold_min: number;
    injectionDelay_min: number;
    lOverDp: { from: number; to: number; change: number };
    resolutionFactor: number;
    pressureFactor: number;
    columnVolume_mL: { from: number; to: number };
  } | null;
  warnings: ChemWarning[];
  prediction: {
    current: { lastPeak_min: number; runTime_min: number };
    variant: { lastPeak_min: number; runTime_min: number };
    notes: string[];
  } | null;
  greenness: { current: GreennessSummary; variant: GreennessSummary };
  /** Over the last 12 months of the ledger. */
  saving: SavingResult & { from: string; to: string; runs: number };
}

export interface MethodVariantSummary {
  id: number;
  methodId: number;
  name: string;
  params: VariantParams;
  /** The method's program the variant was worked out from. */
  baseProgram: ProgramPoint[];
  createdAt: string;
  createdBy: string | null;
  /** The method version it became, and where that version stands. */
  version: { id: number; version: number; state: "pending" | "approved" | "rejected" } | null;
  /** The method's program changed since the variant was worked out. */
  stale: boolean;
  evaluation: VariantEvaluation | null;
  error: string | null;
}

export interface MethodVersionSummary {
  id: number;
  version: number;
  origin: "initial" | "edit" | "variant";
  variantId: number | null;
  variantName: string | null;
  note: string | null;
  state: "pending" | "approved" | "rejected";
  current: boolean;
  runTime_min: number;
  perInjection_mL: number;
  createdAt: string;
  createdBy: string | null;
  createdById: number | null;
  approvedAt: string | null;
  approvedBy: string | null;
}

export interface SupplyRow {
  reagentId: string;
  name: string;
  unit: "mL" | "g";
  stock: number;
  batches: number;
  onHand: number;
  used30: number;
  used90: number;
  perDay: number;
  daysOfSupply: number | null;
  leadTime_days: number;
  safetyStock: number;
  /** True when the lead time and safety stock are the defaults, not the reagent's own settings. */
  defaults: boolean;
  reorderPoint: number;
  state: SupplyState;
  runsOutOn: string | null;
  suggestedOrder: number;
}

export interface FacilityMethodRow {
  methodId: number;
  name: string;
  runs: number;
  injections: number;
  /** Solvent the ledger records for the method's runs over the last 12 months. */
  solvent_mL: number;
  byReagent_mL: Record<string, number>;
  best: { variantId: number; name: string; saved_mL: number; saved: { amount: number; currency: string } | null } | null;
}

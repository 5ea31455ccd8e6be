/**
 * What the ledger's services answer and its screens read: runs, draws, ledger lines, usage,
 * instruments and methods. Types only, so that services, pages and islands share one spelling of
 * each answer without an island importing server code.
 */
import type { Money } from "../billing/money";
import type { ProgramPoint } from "../chem/solvent-use";
import type { UsageGrouping } from "./usage-groupings";

export type LedgerKind = "run" | "draw" | "preparation" | "discard" | "correction";
export type LedgerSource = "manual" | "import" | "run" | "seed";

/** One ledger line before it is written. */
export interface NewLedgerEntry {
  occurredAt: Date;
  projectId: number | null;
  kind: LedgerKind;
  batchId: number | null;
  reagentId: string;
  volume_mL: number;
  mass_g: number | null;
  channel: string | null;
  wasteStreamId: string | null;
  wasteContainerId: number | null;
  sourceKind: LedgerSource;
  sourceId: string | null;
  authorId: number | null;
  reversesId?: number | null;
  reason?: string | null;
}

/** A ledger line as `GET /api/ledger` and the run page show it. */
export interface LedgerLine {
  id: number;
  occurredAt: string;
  kind: LedgerKind;
  projectCode: string | null;
  batchId: number | null;
  batchCode: string | null;
  reagentId: string;
  reagentName: string;
  volume_mL: number;
  mass_g: number | null;
  channel: string | null;
  wasteStreamId: string | null;
  wasteStreamName: string | null;
  wasteContainerCode: string | null;
  sourceKind: LedgerSource;
  sourceId: string | null;
  author: string | null;
  reversesId: number | null;
  reversedById: number | null;
  reason: string | null;
}

export interface RunSummary {
  id: number;
  reference: string | null;
  instrument: string;
  method: string;
  projectCode: string;
  operator: string | null;
  startedAt: string;
  injections: number;
  blanks: number;
  purge_mL: number;
  /** The batch each channel drew from, with its recipe ("MP-FA-W · 0.1 % formic acid in water") when known. */
  channelBatches: Record<string, { id: number; code: string | null; recipeName: string | null }>;
  channelVolumes_mL: Record<string, number>;
  total_mL: number;
  /** Net volume in the ledger (0 once fully reversed). */
  ledger_mL: number;
  importId: number | null;
}

/** What is left in a batch now. */
export interface BatchLeft {
  id: number;
  code: string;
  remaining_mL: number;
  status: string;
}

/** `POST /api/runs`: the run, whether an earlier submit recorded it, and what its batches have left. */
export interface LoggedRun {
  run: RunSummary;
  replayed: boolean;
  batches: BatchLeft[];
}

/** `POST /api/draws`. */
export interface DrawResult {
  batchCode: string;
  volume_mL: number;
  remaining_mL: number;
  entries: number;
  replayed: boolean;
}

/** A batch the run and draw forms offer: not used up, not discarded, not expired. */
export interface UsableBatch {
  id: number;
  code: string;
  name: string;
  channel: string | null;
  remaining_mL: number;
  expiresAt: string;
}

/** A project the forms can charge. */
export interface ProjectChoice {
  id: number;
  code: string;
  name: string;
}

export interface InstrumentSummary {
  id: number;
  name: string;
  kind: string;
  room: string;
  channels: string[];
  wasteContainerId: number | null;
  wasteContainerCode: string | null;
  wasteStream: string | null;
  active: boolean;
  runs: number;
}

export interface MethodSummary {
  id: number;
  name: string;
  description: string | null;
  program: ProgramPoint[];
  reEquilibration_min: number;
  runTime_min: number;
  /** Solvent per injection, from solventUse over the program. */
  perInjection_mL: Record<string, number>;
  perInjectionTotal_mL: number;
  runs: number;
}

/** One project's row of `GET /api/usage?groupBy=project`. */
export interface UsageRow {
  projectCode: string;
  projectName: string;
  clientName: string;
  /** mL per reagent id over the period (corrections included, so a reversed entry counts 0). */
  volumes_mL: Record<string, number>;
  /** g per solid reagent id. */
  masses_g: Record<string, number>;
  runs: number;
  injections: number;
  cost: Money;
  /** Reagents used but without a rate in force: not in the cost. */
  uncosted: string[];
}

export interface UsageAnswer {
  from: string;
  to: string;
  groupBy: "project";
  rows: UsageRow[];
}

export type GroupedBy = Exclude<UsageGrouping, "project">;

/** One group's row of `GET /api/usage?groupBy=client|instrument|reagent|month`. */
export interface GroupedUsageRow {
  /** The group: client id, instrument id, reagent id or YYYY-MM; "none" for entries outside any instrument run. */
  key: string;
  label: string;
  /** mL per reagent id. */
  volumes_mL: Record<string, number>;
  /** g per solid reagent id. */
  masses_g: Record<string, number>;
  /** mL per mobile phase (recipe code); "none" for entries not drawn from a batch. */
  mobilePhases_mL: Record<string, number>;
  /** Runs and injections started in the period; null for the reagent grouping (a run is not a reagent's). */
  runs: number | null;
  injections: number | null;
  /** The cost in the group's currency; null when its projects are billed in more than one (see `costs`). */
  cost: Money | null;
  costs: Money[];
  uncosted: string[];
}

export interface GroupedUsageAnswer {
  from: string;
  to: string;
  groupBy: GroupedBy;
  rows: GroupedUsageRow[];
  /** Recipe code → name, for the mobile phases in the rows. */
  mobilePhases: Record<string, string>;
}

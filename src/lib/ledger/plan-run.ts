/**
 * Working out a run before anything is written: what each channel pumps, which reagents of which
 * batch that is, and every reason the run cannot be recorded. Pure: the run service and the
 * run-log import plan runs with it, and it is tested without a database.
 */
import { solventUse, type ProgramPoint } from "../chem/solvent-use";
import { programChannels } from "./program";
import { CompositionError, splitVolume, wasteStreamOf, type BatchComposition } from "./split";
import type { NewLedgerEntry } from "./types";

/** A batch as a run needs it: state, dates, what is left and what is in it. */
export interface BatchForUse {
  id: number;
  code: string;
  status: string;
  preparedAt: Date;
  expiresAt: Date;
  remaining_mL: number;
  composition: BatchComposition;
}

export interface InstrumentForUse {
  id: number;
  name: string;
  channels: string[];
  wasteContainerId: number | null;
  active: boolean;
}

export interface MethodForUse {
  id: number;
  name: string;
  program: ProgramPoint[];
}

/** One problem with a run, named by the input field it comes from. */
export interface RunProblem {
  field: string;
  message: string;
}

export interface RunPlan {
  channelVolumes: Record<string, number>;
  /** Entries without their source (the run id is known once the run row exists). */
  entries: Omit<NewLedgerEntry, "sourceKind" | "sourceId">[];
  /** mL taken from each batch. */
  batchUse: Map<number, number>;
}

export interface RunToPlan {
  instrument: InstrumentForUse;
  method: MethodForUse;
  projectId: number;
  injections: number;
  blanks: number;
  purge_mL: number;
  channelBatches: Partial<Record<string, number>>;
  startedAt: Date;
  authorId: number | null;
}

/** mL to the ledger's precision. */
export const round4 = (v: number) => Math.round(v * 10_000) / 10_000;

/** Why nothing more may be taken from a batch ("batch B26-1103 is used up"), or null when it may. */
export function batchUnavailable(batch: Pick<BatchForUse, "code" | "status">): string | null {
  if (batch.status === "empty") return `batch ${batch.code} is used up`;
  if (batch.status === "discarded") return `batch ${batch.code} is discarded`;
  return null;
}

/**
 * Works out a run: channel volumes from the method's program (solventUse over injections +
 * blanks, plus the purge volume on each channel in use), each split by its batch's composition.
 * Checks everything that can be checked without writing; `remainingAfter` carries what earlier
 * runs of the same import already took.
 */
export function planRun(
  run: RunToPlan,
  batches: ReadonlyMap<number, BatchForUse>,
  remainingAfter: Map<number, number> = new Map(),
): { plan: RunPlan | null; problems: RunProblem[] } {
  const problems: RunProblem[] = [];
  const { instrument, method } = run;
  if (!instrument.active) problems.push({ field: "instrumentId", message: `${instrument.name} is out of service` });
  let use: Record<string, number> = {};
  try {
    use = solventUse({ program: method.program, injections: run.injections + run.blanks }).byChannel_mL;
  } catch (error) {
    problems.push({
      field: "methodId",
      message: `the program of ${method.name} cannot be integrated: ${error instanceof Error ? error.message : error}`,
    });
  }
  const needed = programChannels(method.program);
  const given = Object.entries(run.channelBatches).filter((e): e is [string, number] => e[1] !== undefined);
  for (const ch of needed) {
    if (!instrument.channels.includes(ch))
      problems.push({ field: "methodId", message: `${method.name} pumps channel ${ch}, which ${instrument.name} does not have` });
    else if (run.channelBatches[ch] === undefined)
      problems.push({ field: `channelBatches.${ch}`, message: `${method.name} pumps channel ${ch}: choose the batch on it` });
  }
  const channelVolumes: Record<string, number> = {};
  const entries: RunPlan["entries"] = [];
  const batchUse = new Map<number, number>();
  for (const [ch, batchId] of given) {
    const field = `channelBatches.${ch}`;
    if (!instrument.channels.includes(ch)) {
      problems.push({ field, message: `${instrument.name} has no channel ${ch}` });
      continue;
    }
    const batch = batches.get(batchId);
    if (!batch) {
      problems.push({ field, message: `no batch with id ${batchId}` });
      continue;
    }
    const unavailable = batchUnavailable(batch);
    if (unavailable) problems.push({ field, message: unavailable });
    if (batch.expiresAt <= run.startedAt)
      problems.push({
        field,
        message: `batch ${batch.code} expired ${batch.expiresAt.toISOString().slice(0, 16).replace("T", " ")} UTC, before the run started`,
      });
    if (batch.preparedAt > run.startedAt) problems.push({ field, message: `batch ${batch.code} was prepared after the run started` });
    const volume = round4((use[ch] ?? 0) + run.purge_mL);
    channelVolumes[ch] = volume;
    if (volume <= 0) continue;
    batchUse.set(batchId, (batchUse.get(batchId) ?? 0) + volume);
    try {
      for (const share of splitVolume(volume, batch.composition)) {
        entries.push({
          occurredAt: run.startedAt,
          projectId: run.projectId,
          kind: "run",
          batchId,
          reagentId: share.reagentId,
          volume_mL: share.volume_mL,
          mass_g: share.mass_g,
          channel: ch,
          wasteStreamId: wasteStreamOf(share.reagentId),
          wasteContainerId: instrument.wasteContainerId,
          authorId: run.authorId,
        });
      }
    } catch (error) {
      if (!(error instanceof CompositionError)) throw error;
      problems.push({ field, message: `batch ${batch.code}: ${error.message}` });
    }
  }
  for (const [batchId, volume] of batchUse) {
    const batch = batches.get(batchId)!;
    const left = remainingAfter.get(batchId) ?? batch.remaining_mL;
    if (volume > left + 1e-9) {
      const channels = given.filter(([, id]) => id === batchId).map(([ch]) => ch);
      problems.push({
        field: `channelBatches.${channels[0]}`,
        message: `batch ${batch.code} has ${round4(left)} mL left; this run needs ${round4(volume)} mL`,
      });
    } else remainingAfter.set(batchId, left - volume);
  }
  return problems.length ? { plan: null, problems } : { plan: { channelVolumes, entries, batchUse }, problems };
}

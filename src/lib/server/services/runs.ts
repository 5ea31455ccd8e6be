/**
 * Logging a run (`POST /api/runs`): what a sequence took from each batch, written to the ledger
 * per reagent and channel in one transaction with the batches' remaining volume. The instrument,
 * method and waste checks here serve the run-log import too.
 */
import { UniqueConstraintError, type Transaction } from "sequelize";
import { planRun, round4, type InstrumentForUse, type MethodForUse, type RunPlan, type RunProblem } from "../../ledger/plan-run";
import type { LoggedRun } from "../../ledger/types";
import type { RunInput } from "../../schemas/runs";
import { recordAudit } from "../audit";
import type { SignedInUser } from "../guard";
import { HttpError } from "../http";
import { withIdempotencyKey } from "../idempotency";
import { Instrument, Method } from "../models/ledger";
import { Project } from "../models/organisation";
import { execute, selectOne } from "../query";
import { batchesLeft, drawFromBatches, loadBatches, problemsError } from "./batch-use";
import { appendEntries, ensureCatalogueRows } from "./ledger";
import { getRun } from "./run-views";
import { checkContainerAccepts, wasteStreamForMix } from "./waste/route";

const instrumentForUse = (i: Instrument): InstrumentForUse => ({
  id: i.id,
  name: i.name,
  channels: i.channels,
  wasteContainerId: i.wasteContainerId,
  active: Boolean(i.active),
});
const methodForUse = (m: Method): MethodForUse => ({ id: m.id, name: m.name, program: m.program });

/** Every instrument and method, as an import plans its rows against them. */
export async function instrumentsAndMethods(
  transaction?: Transaction,
): Promise<{ instruments: InstrumentForUse[]; methods: MethodForUse[] }> {
  const [instruments, methods] = await Promise.all([
    Instrument.findAll({ attributes: ["id", "name", "channels", "wasteContainerId", "active"], transaction }),
    Method.findAll({ attributes: ["id", "name", "program"], transaction }),
  ]);
  return { instruments: instruments.map(instrumentForUse), methods: methods.map(methodForUse) };
}

/**
 * Refuses a run whose mix does not belong in the container the instrument drains to (e.g. a
 * halogenated mix into a non-halogenated carboy). `cache` spares an import the same lookup for
 * every row that pumps the same batches through the same method into the same container.
 */
export async function wasteProblem(
  run: { instrument: InstrumentForUse; methodId: number; channelBatches: Record<string, number> },
  plan: RunPlan,
  transaction?: Transaction,
  cache: Map<string, RunProblem | null> = new Map(),
): Promise<RunProblem | null> {
  const containerId = run.instrument.wasteContainerId;
  if (containerId === null || plan.entries.length === 0) return null;
  const key = `${containerId}|${run.methodId}|${Object.entries(run.channelBatches).sort().join(",")}`;
  if (cache.has(key)) return cache.get(key)!;
  const mix = await wasteStreamForMix(
    plan.entries.map((e) => ({ reagentId: e.reagentId, volume_mL: e.volume_mL, mass_g: e.mass_g ?? null })),
    transaction,
  );
  const acceptance = await checkContainerAccepts(containerId, mix.streamId, transaction ? { transaction } : {});
  const problem = acceptance.ok ? null : { field: "instrumentId", message: acceptance.reason };
  cache.set(key, problem);
  return problem;
}

/** The run row, its ledger entries, the batches' volume and the audit line; answers the new run's id. */
async function recordRun(input: RunInput, actor: SignedInUser, ip: string | null, transaction: Transaction): Promise<number> {
  if (input.startedAt.getTime() > Date.now() + 86_400_000)
    throw new HttpError(400, "startedAt: a run cannot start more than a day from now", { fields: { startedAt: "is in the future" } });
  const [instrumentRow, methodRow, project] = await Promise.all([
    Instrument.findByPk(input.instrumentId, { transaction }),
    Method.findByPk(input.methodId, { transaction }),
    Project.findByPk(input.projectId, { attributes: ["id", "status", "code"], transaction }),
  ]);
  const instrument = instrumentRow && instrumentForUse(instrumentRow);
  const method = methodRow && methodForUse(methodRow);
  const problems: RunProblem[] = [];
  if (!instrument) problems.push({ field: "instrumentId", message: `no instrument with id ${input.instrumentId}` });
  if (!method) problems.push({ field: "methodId", message: `no method with id ${input.methodId}` });
  if (!project) problems.push({ field: "projectId", message: `no project with id ${input.projectId}` });
  else if (project.status === "closed") problems.push({ field: "projectId", message: `project ${project.code} is closed` });
  const operatorId = input.operatorId ?? actor.id;
  if (input.operatorId !== undefined) {
    const operator = await selectOne("SELECT id FROM users WHERE id = ? AND active = 1", { replacements: [input.operatorId], transaction });
    if (!operator) problems.push({ field: "operatorId", message: "no active user with this id" });
  }
  if (problems.length || !instrument || !method || !project) throw problemsError(problems);
  const channelBatches = Object.fromEntries(Object.entries(input.channelBatches).filter(([, v]) => v !== undefined)) as Record<
    string,
    number
  >;
  const batches = await loadBatches({ ids: Object.values(channelBatches) }, transaction, true);
  const { plan, problems: runProblems } = planRun(
    {
      instrument,
      method,
      projectId: project.id,
      injections: input.injections,
      blanks: input.blanks,
      purge_mL: input.purge_mL,
      channelBatches,
      startedAt: input.startedAt,
      authorId: actor.id,
    },
    batches,
  );
  if (!plan) throw problemsError(runProblems);
  const waste = await wasteProblem({ instrument, methodId: method.id, channelBatches }, plan, transaction);
  if (waste) throw problemsError([waste]);
  if (input.reference) {
    const dup = await selectOne<{ id: number }>("SELECT id FROM runs WHERE instrument_id = ? AND reference = ?", {
      replacements: [instrument.id, input.reference],
      transaction,
    });
    if (dup)
      throw new HttpError(409, `reference: run ${input.reference} is already recorded on ${instrument.name}`, {
        fields: { reference: "is already recorded on this instrument" },
        runId: dup.id,
      });
  }
  const now = new Date();
  const { insertId: runId } = await execute(
    `INSERT INTO runs (instrument_id, method_id, project_id, operator_id, reference, started_at, injections, blanks, purge_ml, channel_batches, channel_volumes, idempotency_key, created_at, updated_at)
     VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    {
      replacements: [
        instrument.id,
        method.id,
        project.id,
        operatorId,
        input.reference ?? null,
        input.startedAt,
        input.injections,
        input.blanks,
        input.purge_mL.toFixed(3),
        JSON.stringify(channelBatches),
        JSON.stringify(plan.channelVolumes),
        input.idempotencyKey,
        now,
        now,
      ],
      transaction,
    },
  );
  await ensureCatalogueRows(
    plan.entries.map((e) => e.reagentId),
    transaction,
  );
  await appendEntries(
    plan.entries.map((e) => ({ ...e, sourceKind: "run", sourceId: `run:${runId}` })),
    transaction,
  );
  await drawFromBatches(plan.batchUse, transaction);
  const remaining = (sign: 0 | 1) =>
    Object.fromEntries(
      [...plan.batchUse].map(([batchId, used]) => [
        batches.get(batchId)?.code ?? String(batchId),
        round4((batches.get(batchId)?.remaining_mL ?? 0) - sign * used),
      ]),
    );
  await recordAudit(
    {
      actorId: actor.id,
      action: "run.log",
      entity: "run",
      entityId: runId,
      ip,
      before: { remaining_mL: remaining(0) },
      after: {
        instrumentId: instrument.id,
        methodId: method.id,
        projectId: project.id,
        operatorId,
        reference: input.reference ?? null,
        startedAt: input.startedAt.toISOString(),
        injections: input.injections,
        blanks: input.blanks,
        channelVolumes_mL: plan.channelVolumes,
        ledgerEntries: plan.entries.length,
        remaining_mL: remaining(1),
      },
    },
    transaction,
  );
  return runId;
}

/**
 * Logs one run. The idempotency key makes a repeated submit (a double click, a retry after a
 * lost answer) return the run already recorded instead of recording it twice.
 */
export async function logRun(input: RunInput, actor: SignedInUser, ip: string | null = null): Promise<LoggedRun> {
  let outcome;
  try {
    outcome = await withIdempotencyKey("run", input.idempotencyKey, (transaction) => recordRun(input, actor, ip, transaction));
  } catch (error) {
    // Two runs with one reference on one instrument at the same moment: the unique key lets one through.
    if (error instanceof UniqueConstraintError)
      throw new HttpError(409, "reference: this run reference was recorded on the instrument just now", {
        fields: { reference: "is already recorded on this instrument" },
      });
    throw error;
  }
  const run = (await getRun(outcome.value))!;
  return { run, replayed: outcome.replayed, batches: await batchesLeft(Object.values(run.channelBatches).map((b) => b.id)) };
}

/**
 * Runs and draws: what a sequence or a manual withdrawal took from each batch, written to the
 * ledger per reagent and channel in one transaction with the batches' remaining volume.
 */
import { QueryTypes, UniqueConstraintError, type Transaction } from "sequelize";
import { solventUse, type ProgramPoint } from "../../chem";
import { compositionFromSpec } from "../../ledger/composition";
import { programChannels } from "../../ledger/program";
import { CompositionError, splitVolume, type BatchComposition, type CompositionPart } from "../../ledger/split";
import type { DrawInput, RunInput } from "../../schemas/runs";
import { recordAudit } from "../audit";
import { getSequelize } from "../db";
import type { SignedInUser } from "../guard";
import { HttpError } from "../http";
import { appendEntries, ensureCatalogueRows, wasteStreamOf, type NewLedgerEntry } from "./ledger";
import { checkContainerAccepts, wasteStreamForMix } from "./waste/route";
import { inTransaction } from "./sql";

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

const round4 = (v: number) => Math.round(v * 10_000) / 10_000;

/**
 * Works out a run: channel volumes from the method's program (solventUse over injections +
 * blanks, plus the purge volume on each channel in use), each split by its batch's composition.
 * Checks everything that can be checked without writing; `remainingAfter` carries what earlier
 * runs of the same import already took.
 */
export function planRun(
  run: {
    instrument: InstrumentForUse;
    method: MethodForUse;
    projectId: number;
    injections: number;
    blanks: number;
    purge_mL: number;
    channelBatches: Partial<Record<string, number>>;
    startedAt: Date;
    authorId: number | null;
  },
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
    if (batch.status === "empty" || batch.status === "discarded")
      problems.push({ field, message: `batch ${batch.code} is ${batch.status === "empty" ? "used up" : "discarded"}` });
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

interface BatchRow {
  id: number;
  code: string;
  status: string;
  prepared_at: Date;
  expires_at: Date;
  remaining_ml: string;
  volume_ml: string;
  spec: unknown;
}

/** Loads batches with their composition (recorded components, else the recipe's specification). */
export async function loadBatches(
  where: { ids?: number[]; codes?: string[] },
  transaction?: Transaction,
  lock = false,
): Promise<Map<number, BatchForUse>> {
  const sequelize = getSequelize();
  const ids = where.ids ?? [];
  const codes = where.codes ?? [];
  if (ids.length === 0 && codes.length === 0) return new Map();
  // Only the conditions that name something: with "OR code IN ('')" beside the ids, the optimizer may
  // scan the whole table, and FOR UPDATE would then lock every batch and not only those used.
  const conditions = [...(ids.length ? ["b.id IN (:ids)"] : []), ...(codes.length ? ["b.code IN (:codes)"] : [])];
  const rows = await sequelize.query<BatchRow>(
    `SELECT b.id, b.code, b.status, b.prepared_at, b.expires_at, b.remaining_ml, b.volume_ml, v.spec
       FROM batches b JOIN recipe_versions v ON v.id = b.recipe_version_id
      WHERE ${conditions.join(" OR ")} ${lock ? "FOR UPDATE" : ""}`,
    { type: QueryTypes.SELECT, replacements: { ids, codes }, ...(transaction ? { transaction } : {}) },
  );
  const parts = rows.length
    ? await sequelize.query<{ batch_id: number; reagent_id: string; unit: "mL" | "g"; amount: string }>(
        "SELECT batch_id, reagent_id, unit, COALESCE(actual_amount, target_amount) AS amount FROM batch_components WHERE batch_id IN (:ids) ORDER BY id",
        { type: QueryTypes.SELECT, replacements: { ids: rows.map((r) => r.id) }, ...(transaction ? { transaction } : {}) },
      )
    : [];
  const byBatch = new Map<number, CompositionPart[]>();
  for (const p of parts) {
    const list = byBatch.get(p.batch_id) ?? [];
    list.push({ reagentId: p.reagent_id, unit: p.unit, amount: Number(p.amount) });
    byBatch.set(p.batch_id, list);
  }
  const out = new Map<number, BatchForUse>();
  for (const r of rows) {
    const volume = Number(r.volume_ml);
    let composition: BatchComposition = { volume_mL: volume, parts: byBatch.get(r.id) ?? [] };
    if (composition.parts.length === 0) {
      try {
        composition = compositionFromSpec(typeof r.spec === "string" ? JSON.parse(r.spec) : r.spec, volume);
      } catch {
        // Left empty: planRun reports that the batch's composition is unknown.
      }
    }
    out.set(r.id, {
      id: r.id,
      code: r.code,
      status: r.status,
      preparedAt: new Date(r.prepared_at),
      expiresAt: new Date(r.expires_at),
      remaining_mL: Number(r.remaining_ml),
      composition,
    });
  }
  return out;
}

const parseJson = <T>(v: unknown): T => (typeof v === "string" ? (JSON.parse(v) as T) : (v as T));

export async function loadInstrument(id: number, transaction?: Transaction): Promise<InstrumentForUse | null> {
  const [row] = await getSequelize().query<{
    id: number;
    name: string;
    channels: unknown;
    waste_container_id: number | null;
    active: number;
  }>("SELECT id, name, channels, waste_container_id, active FROM instruments WHERE id = ?", {
    type: QueryTypes.SELECT,
    replacements: [id],
    ...(transaction ? { transaction } : {}),
  });
  return row
    ? {
        id: row.id,
        name: row.name,
        channels: parseJson<string[]>(row.channels),
        wasteContainerId: row.waste_container_id,
        active: Boolean(row.active),
      }
    : null;
}

export async function loadMethod(id: number, transaction?: Transaction): Promise<MethodForUse | null> {
  const [row] = await getSequelize().query<{ id: number; name: string; program: unknown }>(
    "SELECT id, name, program FROM methods WHERE id = ?",
    { type: QueryTypes.SELECT, replacements: [id], ...(transaction ? { transaction } : {}) },
  );
  return row ? { id: row.id, name: row.name, program: parseJson<ProgramPoint[]>(row.program) } : null;
}

/** Takes each batch's volume and moves a fresh batch to "in use"; the rows must be locked. */
export async function drawFromBatches(batchUse: ReadonlyMap<number, number>, transaction: Transaction) {
  for (const [batchId, volume] of batchUse) {
    await getSequelize().query(
      "UPDATE batches SET status = IF(status = 'ready', 'in_use', status), remaining_ml = remaining_ml - ?, updated_at = NOW(3) WHERE id = ? AND remaining_ml >= ?",
      { replacements: [volume.toFixed(4), batchId, volume.toFixed(4)], transaction },
    );
  }
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
  channelBatches: Record<string, { id: number; code: string | null }>;
  channelVolumes_mL: Record<string, number>;
  total_mL: number;
  /** Net volume in the ledger (0 once fully reversed). */
  ledger_mL: number;
  importId: number | null;
}

interface RunRow {
  id: number;
  reference: string | null;
  instrument: string;
  method: string;
  project_code: string;
  operator: string | null;
  started_at: Date;
  injections: number;
  blanks: number;
  purge_ml: string;
  channel_batches: unknown;
  channel_volumes: unknown;
  import_id: number | null;
  ledger_ml: string | null;
}

async function summarise(rows: RunRow[]): Promise<RunSummary[]> {
  const batchIds = [...new Set(rows.flatMap((r) => Object.values(parseJson<Record<string, number>>(r.channel_batches))))];
  const codes = new Map<number, string>();
  if (batchIds.length) {
    for (const b of await getSequelize().query<{ id: number; code: string }>("SELECT id, code FROM batches WHERE id IN (:ids)", {
      type: QueryTypes.SELECT,
      replacements: { ids: batchIds },
    }))
      codes.set(b.id, b.code);
  }
  return rows.map((r) => {
    const batches = parseJson<Record<string, number>>(r.channel_batches);
    const volumes = parseJson<Record<string, number>>(r.channel_volumes);
    return {
      id: r.id,
      reference: r.reference,
      instrument: r.instrument,
      method: r.method,
      projectCode: r.project_code,
      operator: r.operator,
      startedAt: new Date(r.started_at).toISOString(),
      injections: r.injections,
      blanks: r.blanks,
      purge_mL: Number(r.purge_ml),
      channelBatches: Object.fromEntries(Object.entries(batches).map(([ch, id]) => [ch, { id, code: codes.get(id) ?? null }])),
      channelVolumes_mL: volumes,
      total_mL: round4(Object.values(volumes).reduce((a, b) => a + b, 0)),
      ledger_mL: round4(Number(r.ledger_ml ?? 0)),
      importId: r.import_id,
    };
  });
}

const RUN_SELECT = `
  SELECT r.id, r.reference, i.name AS instrument, m.name AS method, p.code AS project_code, u.name AS operator, r.started_at,
         r.injections, r.blanks, r.purge_ml, r.channel_batches, r.channel_volumes, r.import_id,
         (SELECT SUM(l.volume_ml) FROM ledger_entries l WHERE l.source_id = CONCAT('run:', r.id)) AS ledger_ml
    FROM runs r
    JOIN instruments i ON i.id = r.instrument_id
    JOIN methods m ON m.id = r.method_id
    JOIN projects p ON p.id = r.project_id
    LEFT JOIN users u ON u.id = r.operator_id`;

export async function getRun(id: number): Promise<RunSummary | null> {
  const rows = await getSequelize().query<RunRow>(`${RUN_SELECT} WHERE r.id = ?`, { type: QueryTypes.SELECT, replacements: [id] });
  return (await summarise(rows))[0] ?? null;
}

export async function listRuns(limit = 50): Promise<RunSummary[]> {
  const rows = await getSequelize().query<RunRow>(`${RUN_SELECT} ORDER BY r.started_at DESC, r.id DESC LIMIT ?`, {
    type: QueryTypes.SELECT,
    replacements: [limit],
  });
  return summarise(rows);
}

const problemsError = (problems: RunProblem[]) =>
  new HttpError(400, problems.map((p) => `${p.field}: ${p.message}`).join("; "), {
    fields: Object.fromEntries(problems.map((p) => [p.field, p.message])),
  });

async function runByKey(key: string): Promise<number | null> {
  const [row] = await getSequelize().query<{ id: number }>("SELECT id FROM runs WHERE idempotency_key = ?", {
    type: QueryTypes.SELECT,
    replacements: [key],
  });
  return row?.id ?? null;
}

/**
 * Logs one run. The idempotency key makes a repeated submit (a double click, a retry after a
 * lost answer) return the run already recorded instead of recording it twice.
 */
export async function logRun(
  input: RunInput,
  actor: SignedInUser,
  ip: string | null = null,
): Promise<{ run: RunSummary; replayed: boolean; batches: BatchLeft[] }> {
  const sequelize = getSequelize();
  const answer = async (id: number, replayed: boolean) => {
    const run = (await getRun(id))!;
    return { run, replayed, batches: await batchesLeft(Object.values(run.channelBatches).map((b) => b.id)) };
  };
  const existing = await runByKey(input.idempotencyKey);
  if (existing !== null) return answer(existing, true);
  if (input.startedAt.getTime() > Date.now() + 86_400_000)
    throw new HttpError(400, "startedAt: a run cannot start more than a day from now", { fields: { startedAt: "is in the future" } });

  let runId: number;
  try {
    runId = await inTransaction(sequelize, async (transaction) => {
      const [instrument, method] = await Promise.all([
        loadInstrument(input.instrumentId, transaction),
        loadMethod(input.methodId, transaction),
      ]);
      const problems: RunProblem[] = [];
      if (!instrument) problems.push({ field: "instrumentId", message: `no instrument with id ${input.instrumentId}` });
      if (!method) problems.push({ field: "methodId", message: `no method with id ${input.methodId}` });
      const [project] = await sequelize.query<{ id: number; status: string; code: string }>(
        "SELECT id, status, code FROM projects WHERE id = ?",
        { type: QueryTypes.SELECT, replacements: [input.projectId], transaction },
      );
      if (!project) problems.push({ field: "projectId", message: `no project with id ${input.projectId}` });
      else if (project.status === "closed") problems.push({ field: "projectId", message: `project ${project.code} is closed` });
      const operatorId = input.operatorId ?? actor.id;
      if (input.operatorId !== undefined) {
        const [op] = await sequelize.query<{ id: number }>("SELECT id FROM users WHERE id = ? AND active = 1", {
          type: QueryTypes.SELECT,
          replacements: [input.operatorId],
          transaction,
        });
        if (!op) problems.push({ field: "operatorId", message: "no active user with this id" });
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
        const [dup] = await sequelize.query<{ id: number }>("SELECT id FROM runs WHERE instrument_id = ? AND reference = ?", {
          type: QueryTypes.SELECT,
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
      await sequelize.query(
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
      const [{ id }] = (await sequelize.query<{ id: number }>("SELECT LAST_INSERT_ID() AS id", {
        type: QueryTypes.SELECT,
        transaction,
      })) as [{ id: number }];
      const newId = Number(id);
      await ensureCatalogueRows(
        plan.entries.map((e) => e.reagentId),
        transaction,
      );
      await appendEntries(
        plan.entries.map((e) => ({ ...e, sourceKind: "run", sourceId: `run:${newId}` })),
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
          entityId: newId,
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
      return newId;
    });
  } catch (error) {
    // Two submits with one key at the same moment: the unique key lets one through; the other answers with it.
    if (error instanceof UniqueConstraintError) {
      const winner = await runByKey(input.idempotencyKey);
      if (winner !== null) return answer(winner, true);
      throw new HttpError(409, "reference: this run reference was recorded on the instrument just now", {
        fields: { reference: "is already recorded on this instrument" },
      });
    }
    throw error;
  }
  return answer(runId, false);
}

export interface BatchLeft {
  id: number;
  code: string;
  remaining_mL: number;
  status: string;
}

/** What is left in batches now. */
export async function batchesLeft(ids: number[]): Promise<BatchLeft[]> {
  if (ids.length === 0) return [];
  const rows = await getSequelize().query<{ id: number; code: string; remaining_ml: string; status: string }>(
    "SELECT id, code, remaining_ml, status FROM batches WHERE id IN (:ids) ORDER BY code",
    { type: QueryTypes.SELECT, replacements: { ids: [...new Set(ids)] } },
  );
  return rows.map((r) => ({ id: r.id, code: r.code, remaining_mL: Number(r.remaining_ml), status: r.status }));
}

export interface DrawResult {
  batchCode: string;
  volume_mL: number;
  remaining_mL: number;
  entries: number;
  replayed: boolean;
}

/** A manual withdrawal (a wash, a spill, a transfer) from one batch, with its reason. */
export async function logDraw(input: DrawInput, actor: SignedInUser, ip: string | null = null): Promise<DrawResult> {
  const sequelize = getSequelize();
  const scope = "draw";
  const replay = async () => {
    const [row] = await sequelize.query<{ response: unknown }>("SELECT response FROM idempotency_keys WHERE `key` = ? AND scope = ?", {
      type: QueryTypes.SELECT,
      replacements: [input.idempotencyKey, scope],
    });
    return row ? { ...parseJson<DrawResult>(row.response), replayed: true } : null;
  };
  const earlier = await replay();
  if (earlier) return earlier;
  const occurredAt = input.occurredAt ?? new Date();
  try {
    return await inTransaction(sequelize, async (transaction) => {
      const batches = await loadBatches({ ids: [input.batchId] }, transaction, true);
      const batch = batches.get(input.batchId);
      const problems: RunProblem[] = [];
      if (!batch) throw problemsError([{ field: "batchId", message: `no batch with id ${input.batchId}` }]);
      if (batch.status === "empty" || batch.status === "discarded")
        problems.push({ field: "batchId", message: `batch ${batch.code} is ${batch.status === "empty" ? "used up" : "discarded"}` });
      if (batch.remaining_mL < input.volume_mL)
        problems.push({ field: "volume_mL", message: `batch ${batch.code} has ${round4(batch.remaining_mL)} mL left` });
      if (input.projectId !== undefined) {
        const [project] = await sequelize.query<{ id: number }>("SELECT id FROM projects WHERE id = ? AND status <> 'closed'", {
          type: QueryTypes.SELECT,
          replacements: [input.projectId],
          transaction,
        });
        if (!project) problems.push({ field: "projectId", message: "no open project with this id" });
      }
      if (input.wasteContainerId !== undefined) {
        const [container] = await sequelize.query<{ id: number }>(
          "SELECT id FROM waste_containers WHERE id = ? AND status <> 'collected'",
          { type: QueryTypes.SELECT, replacements: [input.wasteContainerId], transaction },
        );
        if (!container) problems.push({ field: "wasteContainerId", message: "no waste container in use with this id" });
      }
      let shares: ReturnType<typeof splitVolume> = [];
      try {
        shares = splitVolume(input.volume_mL, batch.composition);
      } catch (error) {
        if (!(error instanceof CompositionError)) throw error;
        problems.push({ field: "batchId", message: `batch ${batch.code}: ${error.message}` });
      }
      if (problems.length) throw problemsError(problems);
      await sequelize.query("INSERT INTO idempotency_keys (`key`, scope, created_at) VALUES (?, ?, NOW(3))", {
        replacements: [input.idempotencyKey, scope],
        transaction,
      });
      const reason = input.note ? `${input.purpose}: ${input.note}` : input.purpose;
      await ensureCatalogueRows(
        shares.map((s) => s.reagentId),
        transaction,
      );
      await appendEntries(
        shares.map((s) => ({
          occurredAt,
          projectId: input.projectId ?? null,
          kind: "draw" as const,
          batchId: batch.id,
          reagentId: s.reagentId,
          volume_mL: s.volume_mL,
          mass_g: s.mass_g,
          channel: null,
          wasteStreamId: wasteStreamOf(s.reagentId),
          wasteContainerId: input.wasteContainerId ?? null,
          sourceKind: "manual" as const,
          sourceId: `draw:${input.idempotencyKey}`,
          authorId: actor.id,
          reason,
        })),
        transaction,
      );
      await drawFromBatches(new Map([[batch.id, input.volume_mL]]), transaction);
      const result: DrawResult = {
        batchCode: batch.code,
        volume_mL: input.volume_mL,
        remaining_mL: round4(batch.remaining_mL - input.volume_mL),
        entries: shares.length,
        replayed: false,
      };
      await sequelize.query("UPDATE idempotency_keys SET response = ? WHERE `key` = ? AND scope = ?", {
        replacements: [JSON.stringify(result), input.idempotencyKey, scope],
        transaction,
      });
      await recordAudit(
        {
          actorId: actor.id,
          action: "draw.log",
          entity: "batch",
          entityId: batch.id,
          ip,
          before: { remaining_mL: round4(batch.remaining_mL), status: batch.status },
          after: {
            remaining_mL: result.remaining_mL,
            volume_mL: input.volume_mL,
            purpose: input.purpose,
            note: input.note,
            projectId: input.projectId ?? null,
            wasteContainerId: input.wasteContainerId ?? null,
            ledgerEntries: shares.length,
          },
        },
        transaction,
      );
      return result;
    });
  } catch (error) {
    if (error instanceof UniqueConstraintError) {
      const winner = await replay();
      if (winner) return winner;
    }
    throw error;
  }
}

/** Batches a run or draw may use now: not used up, not discarded, not expired. */
export async function usableBatches(now = new Date()) {
  const rows = await getSequelize().query<{
    id: number;
    code: string;
    recipe_name: string;
    channel: string | null;
    remaining_ml: string;
    expires_at: Date;
  }>(
    `SELECT b.id, b.code, r.name AS recipe_name, r.channel, b.remaining_ml, b.expires_at
       FROM batches b JOIN recipe_versions v ON v.id = b.recipe_version_id JOIN recipes r ON r.id = v.recipe_id
      WHERE b.status IN ('ready', 'in_use') AND b.expires_at > ? AND b.remaining_ml > 0
      ORDER BY b.code`,
    { type: QueryTypes.SELECT, replacements: [now] },
  );
  return rows.map((r) => ({
    id: r.id,
    code: r.code,
    name: r.recipe_name,
    channel: r.channel,
    remaining_mL: Number(r.remaining_ml),
    expiresAt: new Date(r.expires_at).toISOString(),
  }));
}

/** Projects that can be charged, for the forms. */
export async function openProjects(clientId: number | null = null) {
  return getSequelize().query<{ id: number; code: string; name: string }>(
    "SELECT id, code, name FROM projects WHERE status <> 'closed' AND (:clientId IS NULL OR client_id = :clientId) ORDER BY code",
    { type: QueryTypes.SELECT, replacements: { clientId } },
  );
}

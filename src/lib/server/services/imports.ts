/**
 * CSV import of run logs: every row checked before anything is written; the commit writes every
 * new run, its ledger entries and the batches' remaining volume in one transaction, or nothing.
 * Rows whose instrument and run reference are already recorded are recognised and skipped, so
 * uploading the same file twice counts each run once.
 */
import { createHash } from "node:crypto";
import { UniqueConstraintError, type Transaction } from "sequelize";
import { readRunLog, type RunLogRow } from "../../imports/run-log";
import type { ImportReport, ImportSummary } from "../../imports/types";
import { planRun, round4, type InstrumentForUse, type MethodForUse, type RunPlan } from "../../ledger/plan-run";
import type { NewLedgerEntry } from "../../ledger/types";
import { recordAudit } from "../audit";
import { getSequelize } from "../db";
import type { SignedInUser } from "../guard";
import { HttpError } from "../http";
import { execute, select, selectOne } from "../query";
import { drawFromBatches, loadBatches } from "./batch-use";
import { appendEntries, ensureCatalogueRows } from "./ledger";
import { instrumentsAndMethods, wasteProblem } from "./runs";
import { inTransaction, multiRowInsert, pipelinedWrites } from "./sql";

const FIELD_TO_COLUMN: Record<string, string> = {
  instrumentId: "instrument",
  methodId: "method",
  projectId: "project",
  operatorId: "operator",
  startedAt: "started_at",
  reference: "run_reference",
};
const columnOf = (field: string) =>
  field.startsWith("channelBatches.") ? `batch_${field.slice("channelBatches.".length)}` : (FIELD_TO_COLUMN[field] ?? field);

interface PlannedRow {
  row: RunLogRow;
  instrument: InstrumentForUse;
  method: MethodForUse;
  projectId: number;
  operatorId: number;
  channelBatches: Record<string, number>;
  plan: RunPlan;
}

/** Resolves names and codes, skips runs already recorded, and plans the rest; nothing is written. */
async function prepare(content: string, fileName: string, actor: SignedInUser, transaction?: Transaction) {
  const checksum = createHash("sha256").update(content).digest("hex");
  const parsed = await readRunLog(content);
  const report: ImportReport = {
    fileName,
    checksum,
    rowCount: parsed.rowCount,
    newRuns: 0,
    alreadyRecorded: 0,
    entries: 0,
    volume_mL: 0,
    issues: [...parsed.issues],
    previousImport: null,
    importId: null,
  };
  const previous = await selectOne<{ id: number; created_at: Date }>(
    "SELECT id, created_at FROM imports WHERE checksum = ? AND status = 'committed' ORDER BY id LIMIT 1",
    { replacements: [checksum], transaction },
  );
  if (previous) report.previousImport = { id: previous.id, at: new Date(previous.created_at).toISOString() };
  if (parsed.issues.length) return { report, planned: [] as PlannedRow[] };

  const rows = parsed.rows;
  const wasteChecks = new Map<string, Awaited<ReturnType<typeof wasteProblem>>>();
  const known = await instrumentsAndMethods(transaction);
  const instruments = new Map<string, InstrumentForUse>(known.instruments.map((i) => [i.name.toLowerCase(), i]));
  const methods = new Map<string, MethodForUse>(known.methods.map((m) => [m.name.toLowerCase(), m]));
  const projects = new Map<string, { id: number; status: string }>();
  for (const p of await select<{ id: number; code: string; status: string }>("SELECT id, code, status FROM projects", { transaction }))
    projects.set(p.code.toLowerCase(), p);
  const emails = [...new Set(rows.map((r) => r.operator?.toLowerCase()).filter((e): e is string => !!e))];
  const users = new Map<string, number>();
  if (emails.length)
    for (const u of await select<{ id: number; email: string }>("SELECT id, email FROM users WHERE email IN (:emails) AND active = 1", {
      replacements: { emails },
      transaction,
    }))
      users.set(u.email.toLowerCase(), u.id);
  const codes = [...new Set(rows.flatMap((r) => Object.values(r.batches)))];
  const batches = await loadBatches({ codes }, transaction, Boolean(transaction));
  const batchByCode = new Map([...batches.values()].map((b) => [b.code.toLowerCase(), b]));

  // Runs already recorded, per instrument, in slices so no IN list grows without bound.
  const recorded = new Set<string>();
  const byInstrument = new Map<number, string[]>();
  for (const r of rows) {
    const instrument = instruments.get(r.instrument.toLowerCase());
    if (!instrument) continue;
    const list = byInstrument.get(instrument.id) ?? [];
    list.push(r.reference);
    byInstrument.set(instrument.id, list);
  }
  for (const [instrumentId, references] of byInstrument) {
    for (let i = 0; i < references.length; i += 5_000) {
      const slice = references.slice(i, i + 5_000);
      for (const hit of await select<{ reference: string }>(
        "SELECT reference FROM runs WHERE instrument_id = :instrumentId AND reference IN (:slice)",
        { replacements: { instrumentId, slice }, transaction },
      )) {
        recorded.add(`${instrumentId}\u0000${hit.reference}`);
      }
    }
  }

  const remainingAfter = new Map<number, number>();
  const planned: PlannedRow[] = [];
  const issue = (row: number, column: string, message: string) => {
    if (report.issues.length < 1_000) report.issues.push({ row, column, message });
  };
  for (const row of rows) {
    const before = report.issues.length;
    const instrument = instruments.get(row.instrument.toLowerCase());
    if (!instrument) issue(row.row, "instrument", `no instrument called "${row.instrument}"`);
    const method = methods.get(row.method.toLowerCase());
    if (!method) issue(row.row, "method", `no method called "${row.method}"`);
    const project = projects.get(row.project.toLowerCase());
    if (!project) issue(row.row, "project", `no project with code "${row.project}"`);
    else if (project.status === "closed") issue(row.row, "project", `project ${row.project} is closed`);
    let operatorId = actor.id;
    if (row.operator) {
      const id = users.get(row.operator.toLowerCase());
      if (id === undefined) issue(row.row, "operator", `no active user with e-mail ${row.operator}`);
      else operatorId = id;
    }
    const channelBatches: Record<string, number> = {};
    for (const [ch, code] of Object.entries(row.batches)) {
      const batch = batchByCode.get(code.toLowerCase());
      if (!batch) issue(row.row, `batch_${ch}`, `no batch with code "${code}"`);
      else channelBatches[ch] = batch.id;
    }
    if (instrument && recorded.has(`${instrument.id}\u0000${row.reference}`)) {
      report.alreadyRecorded++;
      continue;
    }
    if (report.issues.length > before || !instrument || !method || !project) continue;
    const { plan, problems } = planRun(
      {
        instrument,
        method,
        projectId: project.id,
        injections: row.injections,
        blanks: row.blanks,
        purge_mL: row.purge_mL,
        channelBatches,
        startedAt: row.startedAt,
        authorId: actor.id,
      },
      batches,
      remainingAfter,
    );
    for (const p of problems) issue(row.row, columnOf(p.field), p.message);
    if (!plan) continue;
    const waste = await wasteProblem({ instrument, methodId: method.id, channelBatches }, plan, transaction, wasteChecks);
    if (waste) {
      issue(row.row, columnOf(waste.field), waste.message);
      continue;
    }
    planned.push({ row, instrument, method, projectId: project.id, operatorId, channelBatches, plan });
    report.newRuns++;
    report.entries += plan.entries.length;
    report.volume_mL += Object.values(plan.channelVolumes).reduce((a, b) => a + b, 0);
  }
  report.volume_mL = round4(report.volume_mL);
  if (report.issues.length >= 1_000)
    report.issues.push({ row: 1, column: null, message: "Stopped listing after 1,000 problems; fix these and check again." });
  return { report, planned };
}

/** Checks a file and says what a commit would write; writes nothing. */
export async function checkRunLog(content: string, fileName: string, actor: SignedInUser): Promise<ImportReport> {
  return (await prepare(content, fileName, actor)).report;
}

const RUN_COLUMNS = [
  "instrument_id",
  "method_id",
  "project_id",
  "operator_id",
  "reference",
  "started_at",
  "injections",
  "blanks",
  "purge_ml",
  "channel_batches",
  "channel_volumes",
  "import_id",
  "created_at",
  "updated_at",
];
const RUNS_PER_INSERT = 1_000;

/** Writes every new run of a file in one transaction, or nothing when any row has a problem. */
export async function commitRunLog(
  content: string,
  fileName: string,
  actor: SignedInUser,
  ip: string | null = null,
): Promise<ImportReport> {
  try {
    return await inTransaction(getSequelize(), async (transaction) => {
      const prepared = await prepare(content, fileName, actor, transaction);
      const { report } = prepared;
      // The same plans, emptied run by run as their ledger entries are written.
      const planned: (PlannedRow | null)[] = prepared.planned;
      if (report.issues.length) {
        throw new HttpError(
          400,
          `The file has ${report.issues.length} problem${report.issues.length === 1 ? "" : "s"}; nothing was written.`,
          { issues: report.issues, report },
        );
      }
      const now = new Date();
      const { insertId: importId } = await execute(
        "INSERT INTO imports (kind, file_name, checksum, row_count, status, uploaded_by, created_at, updated_at) VALUES ('run-log', ?, ?, ?, 'committed', ?, ?, ?)",
        {
          replacements: [fileName.slice(0, 255), report.checksum, report.newRuns, actor.id, now, now],
          transaction,
        },
      );
      report.importId = importId;

      // The runs first, 1,000 to a statement, then their ledger entries, read from the plans one
      // run at a time as the INSERTs go out (each run's plan is let go once its entries are read),
      // so the entries of a 50,000-run file never sit in memory all at once.
      const reagents = new Set(prepared.planned.flatMap((p) => p.plan.entries.map((e) => e.reagentId)));
      await ensureCatalogueRows(reagents, transaction);
      await pipelinedWrites(transaction, async (send) => {
        for (let start = 0; start < prepared.planned.length; start += RUNS_PER_INSERT) {
          const slice = prepared.planned.slice(start, start + RUNS_PER_INSERT);
          const values: unknown[] = [];
          for (const p of slice) {
            values.push(
              p.instrument.id,
              p.method.id,
              p.projectId,
              p.operatorId,
              p.row.reference,
              p.row.startedAt,
              p.row.injections,
              p.row.blanks,
              p.row.purge_mL.toFixed(3),
              JSON.stringify(p.channelBatches),
              JSON.stringify(p.plan.channelVolumes),
              importId,
              now,
              now,
            );
          }
          await send(multiRowInsert("runs", RUN_COLUMNS, slice.length), values);
        }
      });
      const runIds = new Map<string, number>();
      for (const r of await select<{ id: number; instrument_id: number; reference: string }>(
        "SELECT id, instrument_id, reference FROM runs WHERE import_id = ?",
        { replacements: [importId], transaction },
      )) {
        runIds.set(`${r.instrument_id}\u0000${r.reference}`, r.id);
      }
      const batchUse = new Map<number, number>();
      function* entries(): Generator<NewLedgerEntry> {
        for (let i = 0; i < planned.length; i++) {
          const p = planned[i];
          if (!p) continue;
          planned[i] = null;
          const sourceId = `run:${runIds.get(`${p.instrument.id}\u0000${p.row.reference}`)}`;
          for (const e of p.plan.entries) yield { ...e, sourceKind: "import", sourceId };
          for (const [batchId, v] of p.plan.batchUse) batchUse.set(batchId, (batchUse.get(batchId) ?? 0) + v);
        }
      }
      await appendEntries(entries(), transaction);
      await drawFromBatches(batchUse, transaction);
      await recordAudit(
        {
          actorId: actor.id,
          action: "import.commit",
          entity: "import",
          entityId: importId,
          ip,
          after: {
            fileName,
            checksum: report.checksum,
            rowCount: report.rowCount,
            newRuns: report.newRuns,
            alreadyRecorded: report.alreadyRecorded,
            entries: report.entries,
            volume_mL: report.volume_mL,
          },
        },
        transaction,
      );
      return report;
    });
  } catch (error) {
    if (error instanceof UniqueConstraintError)
      throw new HttpError(409, "file: some of these runs were recorded by another import just now; check the file again", {
        fields: { file: "conflicts with a concurrent import" },
      });
    throw error;
  }
}

export async function listImports(limit = 20): Promise<ImportSummary[]> {
  const rows = await select<{
    id: number;
    file_name: string;
    row_count: number;
    status: string;
    uploaded_by: string | null;
    created_at: Date;
  }>(
    "SELECT i.id, i.file_name, i.row_count, i.status, u.name AS uploaded_by, i.created_at FROM imports i LEFT JOIN users u ON u.id = i.uploaded_by WHERE i.kind = 'run-log' ORDER BY i.id DESC LIMIT ?",
    { replacements: [limit] },
  );
  return rows.map((r) => ({
    id: r.id,
    fileName: r.file_name,
    rowCount: r.row_count,
    status: r.status,
    uploadedBy: r.uploaded_by,
    createdAt: new Date(r.created_at).toISOString(),
  }));
}

/** Methods (`/methods`, `/api/methods`): pump programs, and the solvent one injection uses. */
import { UniqueConstraintError } from "sequelize";
import { solventUse, type ProgramPoint } from "../../chem";
import { rowsToProgram } from "../../ledger/program";
import type { MethodSummary } from "../../ledger/types";
import type { MethodInput } from "../../schemas/methods";
import { recordAudit } from "../audit";
import { getSequelize } from "../db";
import type { SignedInUser } from "../guard";
import { HttpError } from "../http";
import { Method } from "../models/ledger";
import { jsonColumn, select, selectOne } from "../query";
import { ensureFirstVersion, recordEditedVersion } from "./planning/method-history";
import { inTransaction } from "./sql";

interface MethodRow {
  id: number;
  name: string;
  description: string | null;
  program: unknown;
  re_equilibration_min: number;
  run_time_min: number;
  runs: number;
}

function summarise(r: MethodRow): MethodSummary {
  const program = jsonColumn<ProgramPoint[]>(r.program);
  const use = solventUse({ program });
  return {
    id: r.id,
    name: r.name,
    description: r.description,
    program,
    reEquilibration_min: r.re_equilibration_min,
    runTime_min: r.run_time_min,
    perInjection_mL: use.byChannel_mL,
    perInjectionTotal_mL: use.total_mL,
    runs: r.runs,
  };
}

export async function listMethods(): Promise<MethodSummary[]> {
  const rows = await select<MethodRow>(
    "SELECT m.*, (SELECT COUNT(*) FROM runs r WHERE r.method_id = m.id) AS runs FROM methods m ORDER BY m.name",
  );
  return rows.map(summarise);
}

export async function getMethod(id: number): Promise<MethodSummary | null> {
  const row = await selectOne<MethodRow>(
    "SELECT m.*, (SELECT COUNT(*) FROM runs r WHERE r.method_id = m.id) AS runs FROM methods m WHERE m.id = ?",
    {
      replacements: [id],
    },
  );
  return row ? summarise(row) : null;
}

function toColumns(input: MethodInput) {
  const program = rowsToProgram(input.rows);
  const runTime = program[program.length - 1]?.time_min ?? 0;
  return {
    name: input.name,
    description: input.description || null,
    program,
    reEquilibrationMin: Number(input.reEquilibration_min.toFixed(3)),
    runTimeMin: Number(runTime.toFixed(3)),
  };
}

function duplicateName(error: unknown, name: string): never {
  if (error instanceof UniqueConstraintError)
    throw new HttpError(409, `name: a method called ${name} exists already`, { fields: { name: "is taken" } });
  throw error;
}

export async function createMethod(input: MethodInput, actor: SignedInUser): Promise<{ id: number }> {
  return inTransaction(getSequelize(), async (transaction) => {
    const created = await Method.create(toColumns(input), { transaction }).catch((e: unknown) => duplicateName(e, input.name));
    await recordAudit(
      { actorId: actor.id, action: "method.create", entity: "method", entityId: created.id, after: toColumns(input) },
      transaction,
    );
    return { id: created.id };
  });
}

/**
 * Changes a method. Runs already logged keep the volumes they were recorded with (stored on the
 * run and in the ledger), so editing a program never rewrites history.
 */
export async function updateMethod(id: number, input: MethodInput, actor: SignedInUser): Promise<{ id: number }> {
  return inTransaction(getSequelize(), async (transaction) => {
    const method = await Method.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!method) throw new HttpError(404, `id: no method ${id}`);
    const before = { name: method.name, program: method.program, reEquilibrationMin: method.reEquilibrationMin };
    await ensureFirstVersion(id, transaction);
    method.set(toColumns(input));
    await method.save({ transaction }).catch((e: unknown) => duplicateName(e, input.name));
    if (JSON.stringify(before.program) !== JSON.stringify(method.program)) await recordEditedVersion(id, actor.id, transaction);
    await recordAudit(
      { actorId: actor.id, action: "method.update", entity: "method", entityId: id, before, after: toColumns(input) },
      transaction,
    );
    return { id };
  });
}

/**
 * Method versions. Submitting a variant makes the method's next version, pending; a manager other
 * than its author approves it (four eyes, as for recipes), and only then does the method's program
 * change: runs logged before keep the volumes they were recorded with. A pending version whose
 * method changed meanwhile cannot be approved.
 */
import { solventUse, type ProgramPoint } from "../../../chem/solvent-use";
import type { MethodVersionSummary } from "../../../planning/types";
import { recordAudit } from "../../audit";
import { getSequelize } from "../../db";
import type { SignedInUser } from "../../guard";
import { HttpError } from "../../http";
import { execute, select, selectOne } from "../../query";
import { inTransaction } from "../sql";
import { ensureFirstVersion } from "./method-history";
import { methodOr404, parse, sameProgram, iso } from "./variants";

/** Makes the variant the method's next version, waiting for approval. */
export async function submitVariant(
  variantId: number,
  note: string | undefined,
  actor: SignedInUser,
): Promise<{ versionId: number; version: number }> {
  const variant = await selectOne<{ id: number; method_id: number; name: string; base_program: unknown; program: unknown }>(
    "SELECT id, method_id, name, base_program, program FROM method_variants WHERE id = ?",
    { replacements: [variantId] },
  );
  if (!variant) throw new HttpError(404, `id: no variant ${variantId}`);
  const method = await methodOr404(variant.method_id);
  if (!sameProgram(variant.base_program, method.program))
    throw new HttpError(
      409,
      "The method's program has changed since this variant was worked out: propose it again from the current program.",
    );
  return inTransaction(getSequelize(), async (transaction) => {
    await ensureFirstVersion(method.id, transaction);
    const taken = await selectOne<{ id: number }>("SELECT id FROM method_versions WHERE variant_id = ?", {
      replacements: [variantId],
      transaction,
    });
    if (taken) throw new HttpError(409, "This variant has been submitted already.");
    const pending = await selectOne<{ version: number }>(
      "SELECT version FROM method_versions WHERE method_id = ? AND approved_at IS NULL AND rejected_at IS NULL FOR UPDATE",
      { replacements: [method.id], transaction },
    );
    if (pending)
      throw new HttpError(409, `Version ${pending.version} of this method is waiting for approval already; it is decided first.`);
    const last = await selectOne<{ version: number }>("SELECT MAX(version) AS version FROM method_versions WHERE method_id = ?", {
      replacements: [method.id],
      transaction,
    });
    const version = Number(last?.version ?? 1) + 1;
    const program = parse<ProgramPoint[]>(variant.program);
    const runTime = program[program.length - 1]?.time_min ?? 0;
    const { insertId } = await execute(
      `INSERT INTO method_versions (method_id, version, program, run_time_min, origin, variant_id, note, created_by, created_at)
       VALUES (?, ?, ?, ?, 'variant', ?, ?, ?, NOW(3))`,
      { replacements: [method.id, version, JSON.stringify(program), runTime.toFixed(3), variantId, note || null, actor.id], transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        action: "submit",
        entity: "method-version",
        entityId: insertId,
        after: { methodId: method.id, version, variantId },
      },
      transaction,
    );
    return { versionId: insertId, version };
  });
}

/** A manager's decision on a pending version; approving makes it the method's program. */
export async function decideVersion(
  versionId: number,
  decision: "approve" | "reject",
  actor: SignedInUser,
): Promise<{ methodId: number; version: number }> {
  return inTransaction(getSequelize(), async (transaction) => {
    const v = await selectOne<{
      id: number;
      method_id: number;
      version: number;
      program: unknown;
      run_time_min: number;
      created_by: number | null;
      approved_at: Date | null;
      rejected_at: Date | null;
      base_program: unknown;
    }>(
      `SELECT mv.id, mv.method_id, mv.version, mv.program, mv.run_time_min, mv.created_by, mv.approved_at, mv.rejected_at, va.base_program
         FROM method_versions mv LEFT JOIN method_variants va ON va.id = mv.variant_id WHERE mv.id = ? FOR UPDATE`,
      { replacements: [versionId], transaction },
    );
    if (!v) throw new HttpError(404, `id: no method version ${versionId}`);
    if (v.approved_at || v.rejected_at) throw new HttpError(409, `Version ${v.version} has been decided already.`);
    if (decision === "approve" && v.created_by === actor.id)
      throw new HttpError(403, "A method version is approved by someone other than the person who submitted it.");
    const method = await selectOne<{ program: unknown }>("SELECT program FROM methods WHERE id = ? FOR UPDATE", {
      replacements: [v.method_id],
      transaction,
    });
    if (decision === "approve") {
      if (v.base_program !== null && !sameProgram(v.base_program, method?.program))
        throw new HttpError(
          409,
          "The method's program has changed since this version was submitted: reject it and propose the variant again.",
        );
      await execute("UPDATE method_versions SET approved_by = ?, approved_at = NOW(3) WHERE id = ?", {
        replacements: [actor.id, versionId],
        transaction,
      });
      await execute("UPDATE methods SET program = ?, run_time_min = ?, updated_at = NOW(3) WHERE id = ?", {
        replacements: [JSON.stringify(parse(v.program)), Number(v.run_time_min).toFixed(3), v.method_id],
        transaction,
      });
    } else
      await execute("UPDATE method_versions SET rejected_at = NOW(3), approved_by = ? WHERE id = ?", {
        replacements: [actor.id, versionId],
        transaction,
      });
    await recordAudit(
      {
        actorId: actor.id,
        action: decision,
        entity: "method-version",
        entityId: versionId,
        before: { program: method?.program },
        after: { methodId: v.method_id, version: v.version },
      },
      transaction,
    );
    return { methodId: v.method_id, version: Number(v.version) };
  });
}

/** The method's versions, newest first; a method without any shows its program as version 1. */
export async function listVersions(methodId: number): Promise<MethodVersionSummary[]> {
  const method = await methodOr404(methodId);
  const rows = await select<{
    id: number;
    version: number;
    origin: MethodVersionSummary["origin"];
    variant_id: number | null;
    variant_name: string | null;
    note: string | null;
    program: unknown;
    run_time_min: number;
    created_at: Date;
    author: string | null;
    created_by: number | null;
    approved_at: Date | null;
    approver: string | null;
    rejected_at: Date | null;
  }>(
    `SELECT mv.id, mv.version, mv.origin, mv.variant_id, va.name AS variant_name, mv.note, mv.program, mv.run_time_min, mv.created_at,
            a.name AS author, mv.created_by, mv.approved_at, p.name AS approver, mv.rejected_at
       FROM method_versions mv LEFT JOIN method_variants va ON va.id = mv.variant_id
       LEFT JOIN users a ON a.id = mv.created_by LEFT JOIN users p ON p.id = mv.approved_by
      WHERE mv.method_id = ? ORDER BY mv.version DESC`,
    { replacements: [methodId] },
  );
  const currentVersion = rows.find((r) => r.approved_at !== null)?.version;
  const out = rows.map(
    (r): MethodVersionSummary => ({
      id: r.id,
      version: Number(r.version),
      origin: r.origin,
      variantId: r.variant_id,
      variantName: r.variant_name,
      note: r.note,
      state: r.approved_at ? "approved" : r.rejected_at ? "rejected" : "pending",
      current: r.version === currentVersion,
      runTime_min: Number(r.run_time_min),
      perInjection_mL: solventUse({ program: parse<ProgramPoint[]>(r.program) }).total_mL,
      createdAt: iso(r.created_at)!,
      createdBy: r.author,
      createdById: r.created_by,
      approvedAt: iso(r.approved_at),
      approvedBy: r.approver,
    }),
  );
  if (out.length === 0)
    out.push({
      id: 0,
      version: 1,
      origin: "initial",
      variantId: null,
      variantName: null,
      note: null,
      state: "approved",
      current: true,
      runTime_min: method.runTime_min,
      perInjection_mL: method.perInjectionTotal_mL,
      createdAt: "",
      createdBy: null,
      createdById: null,
      approvedAt: null,
      approvedBy: null,
    });
  return out;
}

/**
 * Proposed variants of a method and the method versions they become. A variant is worked out
 * from the method's program as it was then and kept with it. Submitting it makes the next method
 * version, pending; a manager other than its author approves it (four eyes, as for recipes), and
 * only then does the method's program change: runs logged before keep the volumes they were
 * recorded with (see versions.ts).
 */
import type { ProgramPoint } from "../../../chem/solvent-use";
import type { MethodVariantSummary } from "../../../planning/types";
import type { VariantInput, VariantParams } from "../../../schemas/planning";
import { recordAudit } from "../../audit";
import { getSequelize } from "../../db";
import type { SignedInUser } from "../../guard";
import { HttpError } from "../../http";
import { execute, select } from "../../query";
import type { MethodSummary } from "../../../ledger/types";
import { getMethod } from "../methods";
import { inTransaction } from "../sql";
import { evaluate, evaluationContext } from "./evaluate";

export const parse = <T>(v: unknown): T => (typeof v === "string" ? (JSON.parse(v) as T) : (v as T));
export const sameProgram = (a: unknown, b: unknown) => JSON.stringify(parse(a)) === JSON.stringify(parse(b));
export const iso = (d: Date | string | null) => (d === null ? null : new Date(d).toISOString());

export async function methodOr404(id: number): Promise<MethodSummary> {
  const method = await getMethod(id);
  if (!method) throw new HttpError(404, `methodId: no method ${id}`);
  return method;
}

/** Works out a variant without saving it. */
export async function previewVariant(input: VariantInput, now = new Date()) {
  const method = await methodOr404(input.methodId);
  const { methodId: _m, name: _n, ...params } = input;
  return evaluate(method, params, await evaluationContext(method.id, now));
}

export async function createVariant(input: VariantInput, actor: SignedInUser, now = new Date()): Promise<{ id: number }> {
  const method = await methodOr404(input.methodId);
  const { methodId: _m, name, ...params } = input;
  const evaluation = evaluate(method, params, await evaluationContext(method.id, now));
  const label = name || defaultName(params);
  return inTransaction(getSequelize(), async (transaction) => {
    const { insertId } = await execute(
      "INSERT INTO method_variants (method_id, name, params, base_program, program, created_by, created_at) VALUES (?, ?, ?, ?, ?, ?, ?)",
      {
        replacements: [
          method.id,
          label,
          JSON.stringify(params),
          JSON.stringify(method.program),
          JSON.stringify(evaluation.program),
          actor.id,
          now,
        ],
        transaction,
      },
    );
    await recordAudit(
      {
        actorId: actor.id,
        action: "propose",
        entity: "method-variant",
        entityId: insertId,
        after: { methodId: method.id, name: label, params },
      },
      transaction,
    );
    return { id: insertId };
  });
}

export function defaultName(params: VariantParams): string {
  const parts: string[] = [];
  const s = params.substitution;
  if (s)
    parts.push(
      typeof s.to === "string"
        ? `in ${s.to}`
        : `in ${Object.entries(s.to)
            .map(([m, p]) => `${p} % ${m}`)
            .join(" + ")}`,
    );
  const t = params.transfer;
  if (t) parts.push(`on ${t.to.length_mm} × ${t.to.diameter_mm} mm, ${t.to.particle_um} µm`);
  return parts.join(", ").slice(0, 120);
}

interface VariantRow {
  id: number;
  method_id: number;
  name: string;
  params: unknown;
  base_program: unknown;
  program: unknown;
  created_at: Date;
  author: string | null;
  version_id: number | null;
  version: number | null;
  approved_at: Date | null;
  rejected_at: Date | null;
}

/** The method's variants, newest first, each evaluated against today's ledger. */
export async function listVariants(
  methodId: number,
  now = new Date(),
  options: { evaluate?: boolean } = {},
): Promise<MethodVariantSummary[]> {
  const method = await methodOr404(methodId);
  const rows = await select<VariantRow>(
    `SELECT v.*, u.name AS author, mv.id AS version_id, mv.version, mv.approved_at, mv.rejected_at
       FROM method_variants v LEFT JOIN users u ON u.id = v.created_by
       LEFT JOIN method_versions mv ON mv.variant_id = v.id
      WHERE v.method_id = ? ORDER BY v.created_at DESC, v.id DESC`,
    { replacements: [methodId] },
  );
  const context = options.evaluate === false ? null : await evaluationContext(methodId, now);
  return rows.map((r) => {
    const params = parse<VariantParams>(r.params);
    let evaluation: MethodVariantSummary["evaluation"] = null;
    let error: string | null = null;
    if (context) {
      try {
        // Evaluated from the program it was worked out from, so the figures stay those of the proposal.
        evaluation = evaluate({ ...method, program: parse<ProgramPoint[]>(r.base_program) }, params, context);
      } catch (e) {
        error = e instanceof Error ? e.message : String(e);
      }
    }
    return {
      id: r.id,
      methodId: r.method_id,
      name: r.name,
      params,
      baseProgram: parse<ProgramPoint[]>(r.base_program),
      createdAt: iso(r.created_at)!,
      createdBy: r.author,
      version:
        r.version_id === null
          ? null
          : { id: r.version_id, version: Number(r.version), state: r.approved_at ? "approved" : r.rejected_at ? "rejected" : "pending" },
      stale: !sameProgram(r.base_program, method.program),
      evaluation,
      error,
    };
  });
}

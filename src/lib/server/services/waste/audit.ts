import type { Transaction } from "sequelize";
import { recordAudit } from "../../audit";

/** Who changes a waste record, and from where: the audit log keeps both. */
export interface WasteActor {
  actor: { id: number };
  ip?: string | null | undefined;
}

/** Appends one waste change to the audit log, in the transaction that makes the change. */
export async function auditWaste(
  ctx: WasteActor,
  entry: { action: string; entity: string; entityId: string | number; before?: unknown; after?: unknown },
  transaction: Transaction,
): Promise<void> {
  await recordAudit({ actorId: ctx.actor.id, ip: ctx.ip ?? null, ...entry }, transaction);
}

/** A JSON column read back through a raw query (an audit entry's before/after, an alert's detail), which may arrive as text. */
export function storedJson(value: unknown): unknown {
  if (typeof value !== "string") return value;
  try {
    return JSON.parse(value);
  } catch {
    return value;
  }
}

import type { Transaction } from "sequelize";
import { AuditEntry } from "./models/audit";

export interface AuditRecord {
  actorId: number | null;
  action: string;
  entity: string;
  entityId?: string | number | null;
  ip?: string | null;
  before?: unknown;
  after?: unknown;
}

/** Appends one line to the audit log (inside the caller's transaction when given). */
export async function recordAudit(record: AuditRecord, transaction?: Transaction) {
  await AuditEntry.create(
    {
      actorId: record.actorId,
      action: record.action,
      entity: record.entity,
      entityId: record.entityId == null ? null : String(record.entityId),
      ip: record.ip ?? null,
      before: record.before ?? null,
      after: record.after ?? null,
    },
    { transaction },
  );
}

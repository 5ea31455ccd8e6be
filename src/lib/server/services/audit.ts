/** The audit trail (`/audit`, `GET /api/audit`): who changed what, when, before and after; managers and administrators. */
import { auditChanges, describeChanges, entityLabel, type AuditLine } from "../../audit/changes";
import type { ListPage } from "../../lists/types";
import type { AuditListQuery } from "../../schemas/audit";
import { csvResponse, likePrefix, listPage, periodConditions, type Condition, type CsvColumn, type ListSpec } from "../list-page";
import { jsonColumn, select } from "../query";

interface AuditRow {
  id: number;
  created_at: Date;
  actor_id: number | null;
  actor: string | null;
  action: string;
  entity: string;
  entity_id: string | null;
  ip: string | null;
  before: unknown;
  after: unknown;
}

/**
 * Newest first on audit_log(created_at, id); a person's lines on (actor_id, created_at), a kind of
 * record's on (entity, created_at), one record's on (entity, entity_id). A search is an action by
 * its start or a record id exactly.
 */
export const AUDIT_LIST: ListSpec = {
  columns: "a.id, a.created_at, a.actor_id, u.name AS actor, a.action, a.entity, a.entity_id, a.ip, a.before, a.after",
  from: "audit_log a LEFT JOIN users u ON u.id = a.actor_id",
  id: "a.id",
  sorts: { when: "a.created_at" },
  defaultSort: "when",
  defaultDir: "desc",
  search: (q) => ({
    sql: "a.action LIKE :auditAction OR a.entity_id = :auditEntityId",
    replacements: { auditAction: likePrefix(q), auditEntityId: q },
  }),
};

function auditFilters(query: AuditListQuery): Condition[] {
  return [
    ...(query.actor ? [{ sql: "a.actor_id = :auditActor", replacements: { auditActor: query.actor } }] : []),
    ...(query.entity ? [{ sql: "a.entity = :auditEntity", replacements: { auditEntity: query.entity } }] : []),
    ...(query.entityId ? [{ sql: "a.entity_id = :auditRecord", replacements: { auditRecord: query.entityId } }] : []),
    ...periodConditions("a.created_at", "auditAt", query.from, query.to),
  ];
}

function line(row: AuditRow): AuditLine {
  const before = row.before === null ? null : jsonColumn<unknown>(row.before);
  const after = row.after === null ? null : jsonColumn<unknown>(row.after);
  return {
    id: row.id,
    at: new Date(row.created_at).toISOString(),
    actorId: row.actor_id,
    actor: row.actor,
    action: row.action,
    entity: row.entity,
    entityId: row.entity_id,
    ip: row.ip,
    before,
    after,
    changes: auditChanges(before, after),
  };
}

export async function listAudit(query: AuditListQuery): Promise<ListPage<AuditLine>> {
  const page = await listPage<AuditRow>(AUDIT_LIST, query, auditFilters(query));
  return { items: page.items.map(line), nextCursor: page.nextCursor };
}

const AUDIT_CSV: CsvColumn<AuditLine>[] = [
  { header: "at", value: (l) => l.at },
  { header: "person", value: (l) => l.actor },
  { header: "action", value: (l) => l.action },
  { header: "entity", value: (l) => entityLabel(l.entity) },
  { header: "entity_id", value: (l) => l.entityId },
  { header: "changes", value: (l) => describeChanges(l.changes) },
  { header: "before", value: (l) => (l.before === null ? null : JSON.stringify(l.before)) },
  { header: "after", value: (l) => (l.after === null ? null : JSON.stringify(l.after)) },
  { header: "ip", value: (l) => l.ip },
  { header: "id", value: (l) => l.id },
];

export function exportAudit(query: AuditListQuery): Response {
  return csvResponse<AuditRow, AuditLine>(AUDIT_LIST, query, auditFilters(query), (rows) => rows.map(line), AUDIT_CSV, "audit-trail.csv");
}

/** The filters' choices: the people who appear, and the kinds of record (a loose index scan on (entity, …)). */
export async function auditFilterChoices(): Promise<{ people: { id: number; name: string }[]; entities: string[] }> {
  const [people, entities] = await Promise.all([
    select<{ id: number; name: string }>("SELECT id, name FROM users ORDER BY name"),
    select<{ entity: string }>("SELECT DISTINCT entity FROM audit_log ORDER BY entity"),
  ]);
  return { people, entities: entities.map((e) => e.entity) };
}

/**
 * Reading an audit line: what changed between its before and after, field by field, and where the
 * record it is about can be opened. Pure, so the audit page and the CSV export say the same.
 */

export interface FieldChange {
  field: string;
  before: string | null;
  after: string | null;
}

function shown(value: unknown): string | null {
  if (value === undefined || value === null) return null;
  if (typeof value === "string") return value;
  if (typeof value === "number" || typeof value === "boolean") return String(value);
  return JSON.stringify(value);
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);

/**
 * The fields whose value differs, in the order they first appear (before's, then after's new ones).
 * A before or after that is not an object is one field named "value".
 */
export function auditChanges(before: unknown, after: unknown): FieldChange[] {
  if (!isRecord(before) && !isRecord(after)) {
    const b = shown(before);
    const a = shown(after);
    return b === a ? [] : [{ field: "value", before: b, after: a }];
  }
  const from = isRecord(before) ? before : {};
  const to = isRecord(after) ? after : {};
  const fields = [...new Set([...Object.keys(from), ...Object.keys(to)])];
  return fields
    .map((field) => ({ field, before: shown(from[field]), after: shown(to[field]) }))
    .filter((change) => change.before !== change.after);
}

/** "status: ready → in_use; remaining_ml: 900 → 850" for a CSV cell or a title. */
export function describeChanges(changes: readonly FieldChange[]): string {
  return changes.map((c) => `${c.field}: ${c.before ?? "–"} → ${c.after ?? "–"}`).join("; ");
}

/** What an audit entity is called on screen, and the page of one record, where it has one. */
export const AUDIT_ENTITIES: Record<string, { label: string; page?: (id: string) => string }> = {
  batch: { label: "Batch", page: (id) => `/batches/${id}` },
  recipe: { label: "Recipe", page: (id) => `/recipes/${id}` },
  "stock-lot": { label: "Stock lot" },
  run: { label: "Run", page: (id) => `/runs/${id}` },
  import: { label: "Run log import" },
  instrument: { label: "Instrument", page: (id) => `/instruments/${id}` },
  method: { label: "Method", page: (id) => `/methods/${id}` },
  statement: { label: "Statement", page: (id) => `/statements/${id}` },
  invoice: { label: "Invoice" },
  rate: { label: "Rate" },
  pickup: { label: "Waste pickup" },
  waste_container: { label: "Waste container", page: (id) => `/waste/containers/${id}` },
  waste_stream: { label: "Waste stream" },
  user: { label: "Person" },
  settings: { label: "Settings" },
  "preparation-settings": { label: "Preparation settings" },
};

export function entityLabel(entity: string): string {
  return AUDIT_ENTITIES[entity]?.label ?? entity;
}

/** The record's own page, or null when it has none (or no id). */
export function entityPage(entity: string, entityId: string | null): string | null {
  const page = AUDIT_ENTITIES[entity]?.page;
  return page && entityId && /^\d+$/.test(entityId) ? page(entityId) : null;
}

/** The audit view of one record: linked from its page as "history". */
export function historyHref(entity: string, entityId: string | number): string {
  return `/audit?${new URLSearchParams({ entity, entityId: String(entityId) }).toString()}`;
}

/** An audit line as the list and the API give it. */
export interface AuditLine {
  id: number;
  at: string;
  actorId: number | null;
  actor: string | null;
  action: string;
  entity: string;
  entityId: string | null;
  ip: string | null;
  before: unknown;
  after: unknown;
  changes: FieldChange[];
}

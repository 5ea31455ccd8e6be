// The paged lists (lib/server/list-page.ts) through the API of a private app instance: following
// nextCursor until null yields every matching row exactly once, in a stable order, even while rows
// are inserted between page fetches (fast-check chooses the rows, their times — ties included —,
// the page sizes and where the inserts fall); search, filters, sorting, CSV export and who may read.
import fc from "fast-check";
import { QueryTypes } from "sequelize";
import { beforeAll, describe, expect, it } from "vitest";
import { parseCsv } from "../../src/lib/imports/csv";
import { useAppInstance } from "../support/app-instance";
import type { Client } from "../support/http";

const app = useAppInstance();
let manager: Client;
let tech: Client;
let refs: { instrumentId: number; methodId: number; projectId: number; userId: number };

interface Page<T> {
  items: T[];
  nextCursor: string | null;
}

const BASE = Date.parse("2026-05-01T08:00:00Z");
/** Few distinct times, so that many rows share one and the id must break the tie. */
const timeOf = (slot: number) => new Date(BASE + slot * 60_000);

async function insertAudit(entity: string, slots: number[]): Promise<number[]> {
  const ids: number[] = [];
  for (const slot of slots) {
    const [id] = await app.sequelize.query(
      "INSERT INTO audit_log (actor_id, action, entity, entity_id, `before`, `after`, created_at) VALUES (?, 'test.page', ?, ?, NULL, ?, ?)",
      { type: QueryTypes.INSERT, replacements: [refs.userId, entity, String(slot), JSON.stringify({ slot }), timeOf(slot)] },
    );
    ids.push(Number(id));
  }
  return ids;
}

let runSerial = 0;

async function insertRuns(prefix: string, slots: number[]): Promise<number[]> {
  const ids: number[] = [];
  for (const slot of slots) {
    const [id] = await app.sequelize.query(
      `INSERT INTO runs (instrument_id, method_id, project_id, operator_id, reference, started_at, injections, blanks, purge_ml, channel_batches, channel_volumes, created_at, updated_at)
       VALUES (?, ?, ?, ?, ?, ?, 1, 0, 0, '{}', '{}', NOW(), NOW())`,
      {
        type: QueryTypes.INSERT,
        replacements: [refs.instrumentId, refs.methodId, refs.projectId, refs.userId, `${prefix}-${++runSerial}-${slot}`, timeOf(slot)],
      },
    );
    ids.push(Number(id));
  }
  return ids;
}

async function getJson<T>(c: Client, path: string): Promise<T> {
  const response = await c.fetch(path);
  expect(response.status, `${path}: ${app.recentOutput().slice(-800)}`).toBe(200);
  return (await response.json()) as T;
}

let runCounter = 0;

beforeAll(async () => {
  manager = await app.client("manager@demo.test");
  tech = await app.client("tech@demo.test");
  const [row] = await app.sequelize.query<{ instrumentId: number; methodId: number; projectId: number; userId: number }>(
    `SELECT (SELECT MIN(id) FROM instruments) AS instrumentId, (SELECT MIN(id) FROM methods) AS methodId,
            (SELECT MIN(id) FROM projects) AS projectId, (SELECT id FROM users WHERE email = 'manager@demo.test') AS userId`,
    { type: QueryTypes.SELECT },
  );
  refs = row!;
});

/** Pages through `path` (which selects only this case's rows), inserting `later[k]` before the k-th page fetch. */
async function pageThrough(
  c: Client,
  path: string,
  limit: number,
  later: number[][],
  insert: (slots: number[]) => Promise<number[]>,
): Promise<{ seen: { id: number; at: string }[]; added: number[] }> {
  const seen: { id: number; at: string }[] = [];
  const added: number[] = [];
  let cursor: string | null = null;
  let k = 0;
  do {
    if (k > 0 && later[k - 1]?.length) added.push(...(await insert(later[k - 1]!)));
    const url = `${path}&limit=${limit}${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ""}`;
    const page: Page<{ id: number; at?: string; startedAt?: string }> = await getJson(c, url);
    expect(page.items.length).toBeLessThanOrEqual(limit);
    seen.push(...page.items.map((item) => ({ id: item.id, at: (item.at ?? item.startedAt)! })));
    cursor = page.nextCursor;
    k += 1;
    expect(k, "the pages never end").toBeLessThan(500);
  } while (cursor);
  return { seen, added };
}

function expectEachOnceInOrder(seen: { id: number; at: string }[], initial: number[], added: number[]) {
  const ids = seen.map((s) => s.id);
  expect(new Set(ids).size, "a row came twice").toBe(ids.length);
  for (const id of initial) expect(ids, `row ${id} was skipped`).toContain(id);
  for (const id of ids) expect([...initial, ...added], `row ${id} is not one of this case's`).toContain(id);
  // Newest first, ties by id, descending.
  for (let i = 1; i < seen.length; i++) {
    const [a, b] = [seen[i - 1]!, seen[i]!];
    const order = Date.parse(a.at) - Date.parse(b.at) || a.id - b.id;
    expect(order, `rows ${a.id} and ${b.id} out of order`).toBeGreaterThan(0);
  }
}

const rowsAndInserts = fc.record({
  initial: fc.array(fc.integer({ min: 0, max: 20 }), { minLength: 0, maxLength: 40 }),
  limit: fc.integer({ min: 1, max: 12 }),
  later: fc.array(fc.array(fc.integer({ min: -5, max: 25 }), { maxLength: 4 }), { maxLength: 8 }),
});

describe("keyset paging: every row once, in order, while rows are added", () => {
  it("GET /api/audit", async () => {
    await fc.assert(
      fc.asyncProperty(rowsAndInserts, async ({ initial, limit, later }) => {
        const entity = `paging-${++runCounter}-${Math.random().toString(36).slice(2, 6)}`;
        const ids = await insertAudit(entity, initial);
        const { seen, added } = await pageThrough(manager, `/api/audit?entity=${entity}`, limit, later, (s) => insertAudit(entity, s));
        expectEachOnceInOrder(seen, ids, added);
      }),
      { numRuns: 25 },
    );
  });

  it("GET /api/runs, found by a search on the run reference", async () => {
    await fc.assert(
      fc.asyncProperty(rowsAndInserts, async ({ initial, limit, later }) => {
        const prefix = `PG${++runCounter}${Math.random().toString(36).slice(2, 6)}`;
        const ids = await insertRuns(prefix, initial);
        const { seen, added } = await pageThrough(tech, `/api/runs?q=${prefix}`, limit, later, (s) => insertRuns(prefix, s));
        expectEachOnceInOrder(seen, ids, added);
      }),
      { numRuns: 15 },
    );
  });
});

describe("the list API", () => {
  it("keeps id, code, preparedAt and expiresAt on GET /api/batches items and pages by cursor", async () => {
    const first = await getJson<Page<Record<string, unknown>>>(tech, "/api/batches?limit=2");
    expect(first.items).toHaveLength(2);
    for (const item of first.items) expect(Object.keys(item)).toEqual(expect.arrayContaining(["id", "code", "preparedAt", "expiresAt"]));
    expect(first.nextCursor).toEqual(expect.any(String));
    const second = await getJson<Page<{ id: number }>>(tech, `/api/batches?limit=2&cursor=${encodeURIComponent(first.nextCursor!)}`);
    expect(second.items.map((b) => b.id)).not.toContain((first.items[0] as { id: number }).id);
  });

  it("refuses a limit outside 1–500, a cursor that is not one, a cursor of another sort, and an unknown sort (400 naming the field)", async () => {
    for (const [query, field] of [
      ["limit=0", "limit"],
      ["limit=501", "limit"],
      ["cursor=not-a-cursor", "cursor"],
      ["sort=colour", "sort"],
    ]) {
      const response = await tech.fetch(`/api/runs?${query}`);
      expect(response.status, query).toBe(400);
      expect(JSON.stringify(await response.json()), query).toContain(field);
    }
    const byStart = await getJson<Page<unknown>>(tech, "/api/runs?limit=1");
    if (byStart.nextCursor) {
      const response = await tech.fetch(`/api/runs?limit=1&sort=project&cursor=${encodeURIComponent(byStart.nextCursor)}`);
      expect(response.status).toBe(400);
    }
  });

  it("sorts on a shown column in both directions", async () => {
    const up = await getJson<Page<{ code: string }>>(tech, "/api/batches?sort=code&dir=asc&limit=500");
    const codes = up.items.map((b) => b.code);
    expect(codes).toEqual([...codes].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0)));
    const down = await getJson<Page<{ code: string }>>(tech, "/api/batches?sort=code&dir=desc&limit=500");
    expect(down.items.map((b) => b.code)).toEqual([...codes].reverse());
  });

  it("exports as CSV exactly the rows the search and filters select, past one export page", async () => {
    const prefix = `CSV${Math.random().toString(36).slice(2, 7)}`;
    const ids = await insertRuns(
      prefix,
      Array.from({ length: 620 }, (_, i) => i % 50),
    );
    await insertRuns(`X${prefix}`, [1, 2, 3]); // does not start with the prefix: not selected
    const response = await tech.fetch(`/api/runs?q=${prefix}&format=csv&limit=5`);
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toContain("text/csv");
    const [header, ...rows] = parseCsv(await response.text()).map((r) => r.fields);
    const idColumn = header!.indexOf("id");
    expect(rows.map((r) => Number(r[idColumn])).sort((a, b) => a - b)).toEqual([...ids].sort((a, b) => a - b));
    expect(rows.every((r) => r[header!.indexOf("reference")]!.startsWith(`${prefix}-`))).toBe(true);
  });

  it("filters the audit trail by person and period, and lets only managers and administrators read it", async () => {
    const entity = `filters-${Math.random().toString(36).slice(2, 6)}`;
    await insertAudit(entity, [0, 60 * 24, 60 * 48]); // 1, 2 and 3 May
    const mayTwo = await getJson<Page<{ entityId: string; actor: string; changes: { field: string }[] }>>(
      manager,
      `/api/audit?entity=${entity}&from=2026-05-02&to=2026-05-02&actor=${refs.userId}`,
    );
    expect(mayTwo.items.map((l) => l.entityId)).toEqual([String(60 * 24)]);
    expect(mayTwo.items[0]!.changes.map((c) => c.field)).toEqual(["slot"]);
    const someoneElse = await getJson<Page<unknown>>(manager, `/api/audit?entity=${entity}&actor=${refs.userId + 100000}`);
    expect(someoneElse.items).toEqual([]);
    expect((await tech.fetch("/api/audit")).status).toBe(403);
    expect((await (await app.client()).fetch("/api/audit")).status).toBe(401);
  });
});

/**
 * The one server helper behind every paged list: keyset paging on (sort value, id), sorting on a
 * list's shown columns, a search condition, the list's filters, and a CSV export of exactly the
 * rows those select. Never OFFSET: a page starts after the previous page's last (value, id), so it
 * costs the same on page 1 and page 200 (on an index whose order matches), and a row added while a
 * person pages is neither repeated nor makes another row skip.
 */
import { decodeCursor, encodeCursor } from "../lists/cursor";
import { csvLine, type CsvValue } from "../lists/csv";
import type { ListPage } from "../lists/types";
import type { ListQuery } from "../schemas/lists";
import { HttpError } from "./http";
import { select } from "./query";

/** A SQL condition with its own named replacements (names unique across a list's conditions). */
export interface Condition {
  sql: string;
  replacements?: Record<string, unknown>;
}

export interface ListSpec {
  /** The selected columns, without SELECT. */
  columns: string;
  /** FROM and JOINs, without WHERE: the listed table first (it is joined in this order), lookups after it. */
  from: string;
  /** The unique, never-null tie breaker, e.g. `r.id`. */
  id: string;
  /** Sort key (as in `?sort=`) → a never-null SQL expression; the key list is what may be sorted. */
  sorts: Record<string, string>;
  defaultSort: string;
  defaultDir: "asc" | "desc";
  /** The condition a search text adds (it may look something up first), or none when the list has no search. */
  search?: (q: string) => Condition | Promise<Condition>;
}

interface Resolved {
  sort: string;
  dir: "asc" | "desc";
  expression: string;
}

function resolveSort(spec: ListSpec, query: Pick<ListQuery, "sort" | "dir">): Resolved {
  const sort = query.sort ?? spec.defaultSort;
  const expression = spec.sorts[sort];
  if (!expression) throw new HttpError(400, `sort: one of ${Object.keys(spec.sorts).join(", ")}`, { fields: { sort: "unknown column" } });
  return { sort, dir: query.dir ?? (query.sort ? "asc" : spec.defaultDir), expression };
}

async function conditionsOf(spec: ListSpec, query: Pick<ListQuery, "q">, filters: Condition[]): Promise<Condition[]> {
  return [...filters, ...(query.q && spec.search ? [await spec.search(query.q)] : [])];
}

async function fetchRows<Row extends object>(
  spec: ListSpec,
  resolved: Resolved,
  conditions: Condition[],
  after: { value: unknown; id: number } | null,
  limit: number,
): Promise<{ rows: Row[]; last: { value: unknown; id: number } | null; more: boolean }> {
  const { expression, dir } = resolved;
  const where = conditions.map((c) => `(${c.sql})`);
  const replacements: Record<string, unknown> = Object.assign({}, ...conditions.map((c) => c.replacements ?? {}));
  if (after) {
    // Spelled out rather than as a row comparison, so that the range optimiser uses the (value, id) index.
    const op = dir === "desc" ? "<" : ">";
    where.push(`(${expression} ${op} :listAfterValue OR (${expression} = :listAfterValue AND ${spec.id} ${op} :listAfterId))`);
    replacements.listAfterValue = after.value;
    replacements.listAfterId = after.id;
  }
  replacements.listLimit = limit + 1;
  const rows = await select<Row & { list_sort_value: unknown; list_row_id: number }>(
    // STRAIGHT_JOIN: the listed table first, as written, so that its (value, id) index gives the order and
    // the LIMIT stops the walk; otherwise the optimiser may start from a small joined table and sort everything.
    `SELECT STRAIGHT_JOIN ${spec.columns}, ${expression} AS list_sort_value, ${spec.id} AS list_row_id
       FROM ${spec.from}
      ${where.length ? `WHERE ${where.join(" AND ")}` : ""}
      ORDER BY ${expression} ${dir}, ${spec.id} ${dir}
      LIMIT :listLimit`,
    { replacements },
  );
  const more = rows.length > limit;
  const page = more ? rows.slice(0, limit) : rows;
  const tail = page[page.length - 1];
  return { rows: page, last: tail ? { value: tail.list_sort_value, id: tail.list_row_id } : null, more };
}

/** One page of a list, and the cursor of the next. */
export async function listPage<Row extends object>(
  spec: ListSpec,
  query: Pick<ListQuery, "limit" | "cursor" | "q" | "sort" | "dir">,
  filters: Condition[] = [],
): Promise<ListPage<Row>> {
  const resolved = resolveSort(spec, query);
  let after: { value: unknown; id: number } | null = null;
  if (query.cursor) {
    const cursor = decodeCursor(query.cursor);
    if (!cursor || cursor.sort !== resolved.sort || cursor.dir !== resolved.dir) {
      throw new HttpError(400, "cursor: not a cursor of this list and sort; start again from the first page", {
        fields: { cursor: "not valid here" },
      });
    }
    after = { value: cursor.value, id: cursor.id };
  }
  const { rows, last, more } = await fetchRows<Row>(spec, resolved, await conditionsOf(spec, query, filters), after, query.limit);
  const nextCursor =
    more && last
      ? encodeCursor({
          sort: resolved.sort,
          dir: resolved.dir,
          value: last.value instanceof Date ? last.value : typeof last.value === "number" ? last.value : String(last.value),
          id: last.id,
        })
      : null;
  return { items: rows, nextCursor };
}

export interface CsvColumn<Row> {
  header: string;
  value: (row: Row) => CsvValue;
}

const EXPORT_PAGE = 500;

/**
 * Every row the query's search and filters select, in its order, as a streamed CSV file (the
 * query's limit and cursor are ignored: an export is the whole filtered list). Rows are read a
 * page at a time by the same keyset, so a large export holds one page in memory.
 */
export function csvResponse<Row extends object, Item>(
  spec: ListSpec,
  query: Pick<ListQuery, "q" | "sort" | "dir">,
  filters: Condition[],
  map: (rows: Row[]) => Promise<Item[]> | Item[],
  columns: CsvColumn<Item>[],
  fileName: string,
): Response {
  const resolved = resolveSort(spec, query);
  let conditions: Condition[] = [];
  const encoder = new TextEncoder();
  let after: { value: unknown; id: number } | null = null;
  let started = false;
  let done = false;
  const body = new ReadableStream<Uint8Array>({
    async pull(controller) {
      if (!started) {
        started = true;
        conditions = await conditionsOf(spec, query, filters);
        controller.enqueue(encoder.encode(csvLine(columns.map((c) => c.header))));
        return;
      }
      if (done) return controller.close();
      try {
        const page = await fetchRows<Row>(spec, resolved, conditions, after, EXPORT_PAGE);
        const items = await map(page.rows);
        if (items.length) controller.enqueue(encoder.encode(items.map((item) => csvLine(columns.map((c) => c.value(item)))).join("")));
        after = page.last;
        done = !page.more;
        if (done) controller.close();
      } catch (error) {
        controller.error(error);
      }
    },
  });
  return new Response(body, {
    status: 200,
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${fileName}"`,
      "cache-control": "no-store",
    },
  });
}

/**
 * The instants a period of days covers: from the start of `from` to the start of the day after `to`.
 * Days are UTC days until the facility's time zone is set; this is the one place that changes then.
 */
export function periodConditions(column: string, name: string, from?: string, to?: string): Condition[] {
  const out: Condition[] = [];
  if (from) out.push({ sql: `${column} >= :${name}From`, replacements: { [`${name}From`]: new Date(`${from}T00:00:00.000Z`) } });
  if (to) {
    const end = new Date(`${to}T00:00:00.000Z`);
    end.setUTCDate(end.getUTCDate() + 1);
    out.push({ sql: `${column} < :${name}To`, replacements: { [`${name}To`]: end } });
  }
  return out;
}

/** A search text as a LIKE prefix pattern (its own % and _ taken literally). */
export function likePrefix(q: string): string {
  return `${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/** A search text as a LIKE "contains" pattern. */
export function likeContains(q: string): string {
  return `%${likePrefix(q)}`;
}

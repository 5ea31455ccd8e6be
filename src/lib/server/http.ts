import type { ZodType, ZodTypeDef } from "zod";
import { formatZodError, fieldErrors } from "../schemas/zod-error";

/** An error that maps to an HTTP answer with a JSON message. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly details: Record<string, unknown> = {},
    readonly headers: Record<string, string> = {},
  ) {
    super(message);
  }
}

export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), {
    status,
    headers: { "content-type": "application/json; charset=utf-8", "cache-control": "no-store", ...headers },
  });
}

/** The largest JSON body any route takes (a recipe or a gradient program is a few kB). */
export const JSON_MAX_BYTES = 1024 * 1024;

/**
 * Reads a request body as text, refusing it with 413 as soon as it passes `maxBytes` (by its
 * Content-Length, or while it streams in when it has none), so no upload can fill the memory.
 */
export async function readBodyText(request: Request, maxBytes: number, tooBig: string): Promise<string> {
  const declared = Number(request.headers.get("content-length") ?? 0);
  if (declared > maxBytes) throw new HttpError(413, tooBig);
  return new TextDecoder().decode(await readBodyBytes(request, maxBytes, tooBig));
}

/** Like readBodyText, but the bytes as they came. */
export async function readBodyBytes(request: Request, maxBytes: number, tooBig: string): Promise<Uint8Array<ArrayBuffer>> {
  if (Number(request.headers.get("content-length") ?? 0) > maxBytes) throw new HttpError(413, tooBig);
  if (!request.body) return new Uint8Array(0);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > maxBytes) {
      await reader.cancel().catch(() => undefined);
      throw new HttpError(413, tooBig);
    }
    chunks.push(value);
  }
  const out = new Uint8Array(size);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/** Reads a JSON body and validates it; bad input is a 400 naming the field, never a 500. */
export async function readJson<T>(request: Request, schema: ZodType<T, ZodTypeDef, unknown>): Promise<T> {
  const type = request.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("application/json")) {
    throw new HttpError(415, "body: send JSON with content-type application/json");
  }
  const text = await readBodyText(request, JSON_MAX_BYTES, `body: larger than ${JSON_MAX_BYTES / 1024} kB`);
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch {
    throw new HttpError(400, "body: not valid JSON");
  }
  const broken = brokenTextAt(raw);
  if (broken !== null)
    throw new HttpError(400, `${broken || "body"}: holds a character that is not valid text (a lone UTF-16 surrogate)`, {
      fields: { [broken || "body"]: "not valid text" },
    });
  return validate(raw, schema);
}

const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/**
 * The path of the first string (or key) in a parsed JSON value that holds a lone surrogate, which
 * JSON's `\uD800` escape can produce but no database column can store; null when there is none.
 */
function brokenTextAt(root: unknown): string | null {
  // Iterative, so a body nested thousands of levels deep cannot overflow the stack.
  const stack: [unknown, string][] = [[root, ""]];
  while (stack.length) {
    const [value, path] = stack.pop()!;
    if (typeof value === "string") {
      if (LONE_SURROGATE.test(value)) return path;
    } else if (value !== null && typeof value === "object") {
      for (const [key, child] of Object.entries(value)) {
        const at = path ? `${path}.${key}` : key;
        if (LONE_SURROGATE.test(key)) return at;
        stack.push([child, at]);
      }
    }
  }
  return null;
}

/**
 * Validates a value against a schema; bad input is a 400 naming the field. Route parameters are
 * validated as the object they are, so the message names them: `validate(params, idParam)`.
 */
export function validate<T>(raw: unknown, schema: ZodType<T, ZodTypeDef, unknown>): T {
  const result = schema.safeParse(raw);
  if (!result.success) throw new HttpError(400, formatZodError(result.error), { fields: fieldErrors(result.error) });
  return result.data;
}

/** Query parameters as a plain object, for schema parsing. */
export function queryOf(url: URL): Record<string, string> {
  return Object.fromEntries(url.searchParams.entries());
}

const DATABASE_DOWN = /SequelizeConnection|ECONNREFUSED|ER_GET_CONNECTION_TIMEOUT|Connection.*(closed|lost|timeout)|pool timeout/i;
/**
 * A connection that broke under a query: the server went away (killed, shut down, restarting) or
 * the network did. Checked on database errors only, so a payments or mail outage is not "the
 * database". SQLSTATE class 08 is "connection exception"; the driver also marks these `fatal`.
 */
const LINK_BROKEN =
  /socket has unexpectedly been closed|connection closed|Connection was killed|server shutdown in progress|ECONNRESET|EPIPE/i;
const LINK_CODES = new Set([
  "ER_SOCKET_UNEXPECTED_CLOSE",
  "ER_CONNECTION_ALREADY_CLOSED",
  "ER_CMD_CONNECTION_CLOSED",
  "ER_CONNECTION_KILLED",
  "ER_SERVER_SHUTDOWN",
  "ER_CONNECTION_TIMEOUT",
  "ER_SOCKET_TIMEOUT",
  "ECONNRESET",
  "EPIPE",
  "ETIMEDOUT",
]);

/** True for errors that mean "the database is unreachable", which answer 503 rather than 500. */
export function isDatabaseDown(error: unknown): boolean {
  if (!(error instanceof Error)) return false;
  if (DATABASE_DOWN.test(`${error.name} ${error.message}`)) return true;
  if (!error.name.startsWith("Sequelize") && error.name !== "SqlError") return false;
  // Sequelize keeps the driver's error as `parent` (and `original`).
  const cause = ((error as { parent?: unknown }).parent ?? error) as { code?: unknown; sqlState?: unknown; message?: unknown };
  if (typeof cause.code === "string" && LINK_CODES.has(cause.code)) return true;
  if (typeof cause.sqlState === "string" && cause.sqlState.startsWith("08")) return true;
  return LINK_BROKEN.test(`${error.message} ${typeof cause.message === "string" ? cause.message : ""}`);
}

/** Turns any thrown error into the JSON answer a client can act on. */
export function errorResponse(error: unknown): Response {
  if (error instanceof HttpError) return json({ error: error.message, ...error.details }, error.status, error.headers);
  if (isDatabaseDown(error)) return json({ error: "The database is unavailable; try again in a moment." }, 503, { "retry-after": "5" });
  console.error(error);
  return json({ error: "Something went wrong on our side; it has been logged." }, 500);
}

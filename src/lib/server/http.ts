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

/** Reads a JSON body and validates it; bad input is a 400 naming the field, never a 500. */
export async function readJson<T>(request: Request, schema: ZodType<T, ZodTypeDef, unknown>): Promise<T> {
  const type = request.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("application/json")) {
    throw new HttpError(415, "body: send JSON with content-type application/json");
  }
  let raw: unknown;
  try {
    raw = await request.json();
  } catch {
    throw new HttpError(400, "body: not valid JSON");
  }
  return validate(raw, schema);
}

export function validate<T>(raw: unknown, schema: ZodType<T, ZodTypeDef, unknown>): T {
  const result = schema.safeParse(raw);
  if (!result.success) {
    throw new HttpError(400, formatZodError(result.error), { fields: fieldErrors(result.error) });
  }
  return result.data;
}

/** Query parameters as a plain object, for schema parsing. */
export function queryOf(url: URL): Record<string, string> {
  return Object.fromEntries(url.searchParams.entries());
}

const DATABASE_DOWN = /SequelizeConnection|ECONNREFUSED|ER_GET_CONNECTION_TIMEOUT|Connection.*(closed|lost|timeout)|pool timeout/i;

/** True for errors that mean "the database is unreachable", which answer 503 rather than 500. */
export function isDatabaseDown(error: unknown): boolean {
  if (!(error instanceof Error)) return false;
  return DATABASE_DOWN.test(`${error.name} ${error.message}`);
}

/** Turns any thrown error into the JSON answer a client can act on. */
export function errorResponse(error: unknown): Response {
  if (error instanceof HttpError) return json({ error: error.message, ...error.details }, error.status, error.headers);
  if (isDatabaseDown(error)) return json({ error: "The database is unavailable; try again in a moment." }, 503, { "retry-after": "5" });
  console.error(error);
  return json({ error: "Something went wrong on our side; it has been logged." }, 500);
}

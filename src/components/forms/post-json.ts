// Kept apart from form.tsx so that islands which only post (buttons, hand-made forms) do not
// load react-hook-form with it.
import { formatZodError } from "../../lib/schemas/zod-error";

/** An API route's refusal: its status, its message, and the message for each field it names. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    /** Field path (`components.0.stockLotId`) → message; empty when the refusal names no field. */
    readonly fields: Readonly<Record<string, string>> = {},
  ) {
    super(message);
    this.name = "ApiError";
  }
}

const isFieldMap = (value: unknown): value is Record<string, string> =>
  value !== null && typeof value === "object" && !Array.isArray(value) && Object.values(value).every((v) => typeof v === "string");

/** The JSON an API route answered; throws ApiError with the route's message and fields on failure. */
export async function readAnswer<T = unknown>(response: Response): Promise<T> {
  if (response.status === 204) return undefined as T;
  const data = (await response.json().catch(() => ({}))) as { error?: unknown; fields?: unknown };
  if (!response.ok)
    throw new ApiError(
      response.status,
      typeof data.error === "string" ? data.error : `The request failed (${response.status}).`,
      isFieldMap(data.fields) ? data.fields : {},
    );
  return data as T;
}

/** Posts JSON to an API route; throws ApiError on failure. */
export async function postJson<T = unknown>(url: string, body: unknown, method = "POST"): Promise<T> {
  return readAnswer<T>(await fetch(url, { method, headers: { "content-type": "application/json" }, body: JSON.stringify(body) }));
}

/** Whatever was thrown (a refusal, a failed fetch, a schema's complaint), as a sentence for the person at the screen. */
export function errorMessage(error: unknown): string {
  // Duck-typed so that islands without zod do not load it for this check.
  if (error instanceof Error && error.name === "ZodError" && Array.isArray((error as { issues?: unknown }).issues))
    return formatZodError(error as Parameters<typeof formatZodError>[0]);
  return error instanceof Error ? error.message : String(error);
}

import type { ZodError } from "zod";

/** One readable sentence naming each bad field, e.g. "email: Enter a valid e-mail address". */
export function formatZodError(error: ZodError): string {
  return error.issues
    .map((issue) => {
      const field = issue.path.length ? issue.path.join(".") : "body";
      return `${field}: ${issue.message}`;
    })
    .join("; ");
}

/** Field → first message, for forms and JSON answers. */
export function fieldErrors(error: ZodError): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of error.issues) {
    const field = issue.path.length ? issue.path.join(".") : "body";
    out[field] ??= issue.message;
  }
  return out;
}

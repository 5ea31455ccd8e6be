import { useCallback } from "react";
import type { FieldPath, FieldValues, UseFormReturn } from "react-hook-form";
import { ApiError, errorMessage } from "./post-json";

type FormParts<T extends FieldValues> = Pick<UseFormReturn<T>, "getValues" | "setError">;

/**
 * Whether the form's values have a field at this path. Registered inputs hold at least "", so a
 * name the form does not hold ("body", a route parameter, an item of a list the form edits as
 * text) finds no value.
 */
function holds(values: unknown, path: string): boolean {
  let at = values;
  for (const step of path.split(".")) {
    if (at === null || typeof at !== "object") return false;
    at = (at as Record<string, unknown>)[step];
  }
  return at !== undefined;
}

/**
 * Puts a refused submit's field messages beside the fields of the form (react-hook-form's
 * `setError`, nested paths such as `components.0.stockLotId` too) and focuses the first. Returns
 * what the form shows on its own line: null when every field the refusal names is one the form
 * holds, the refusal's message when it names none, and "field: message" for the rest otherwise.
 */
export function showServerErrors<T extends FieldValues>(form: FormParts<T>, error: unknown): string | null {
  const named = error instanceof ApiError ? Object.entries(error.fields) : [];
  const values: unknown = form.getValues();
  const held = named.filter(([name]) => holds(values, name));
  held.forEach(([name, message], i) => form.setError(name as FieldPath<T>, { type: "server", message }, { shouldFocus: i === 0 }));
  if (held.length === 0) return errorMessage(error);
  const rest = named.filter((entry) => !held.includes(entry));
  return rest.length ? rest.map(([name, message]) => `${name}: ${message}`).join("; ") : null;
}

/**
 * The one way a react-hook-form form shows a refused submit:
 * `catch (error) { setProblem(showServerError(error)); }`.
 */
export function useServerErrors<T extends FieldValues>({ getValues, setError }: FormParts<T>): (error: unknown) => string | null {
  return useCallback((error: unknown) => showServerErrors({ getValues, setError }, error), [getValues, setError]);
}

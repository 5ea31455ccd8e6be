import { z } from "zod";
import { parseLocalDateTime } from "../format";

/** A database id from a form or a query string; "" and null mean "none". */
export const id = (label = "Choose one") =>
  z.preprocess(
    (v) => (v === "" || v === null ? undefined : v),
    z.coerce.number({ required_error: label, invalid_type_error: label }).int(label).positive(label),
  );

/** `{id}` in a route path, e.g. `/api/batches/{id}`: `validate(params, idParam)`, `idParam.safeParse(Astro.params)`. */
export const idParam = z.object({ id: id("must be a positive whole number") });

/** Like `id`, but "" and null leave it out. */
export const optionalId = (label = "must be a positive whole number") =>
  z.preprocess(
    (v) => (v === "" || v === null ? undefined : v),
    z.coerce.number({ invalid_type_error: label }).int(label).positive(label).optional(),
  );

/** A number typed into a field (forms send text). */
export const amount = (options: { min?: number; max?: number; label?: string } = {}) =>
  z.preprocess(
    (v) => (typeof v === "string" && v.trim() !== "" ? Number(v.replace(",", ".")) : v),
    z
      .number({ required_error: options.label ?? "Enter a number", invalid_type_error: options.label ?? "Enter a number" })
      .finite("Enter a number")
      .min(options.min ?? 0, `must be at least ${options.min ?? 0}`)
      .max(options.max ?? Number.MAX_SAFE_INTEGER, `must be at most ${options.max ?? Number.MAX_SAFE_INTEGER}`),
  );

export const wholeNumber = (options: { min?: number; max?: number } = {}) =>
  z.preprocess(
    (v) => (typeof v === "string" && v.trim() !== "" ? Number(v) : v),
    z
      .number({ required_error: "Enter a whole number", invalid_type_error: "Enter a whole number" })
      .int("Enter a whole number")
      .min(options.min ?? 0, `must be at least ${options.min ?? 0}`)
      .max(options.max ?? 1_000_000, `must be at most ${options.max ?? 1_000_000}`),
  );

/** The years a stored moment or day may fall in: within what the database's DATETIME holds, and sane for a lab. */
const FIRST_YEAR = 1970;
const LAST_YEAR = 2199;

/** A moment, ISO 8601 (a value without a zone is read as UTC), in FIRST_YEAR…LAST_YEAR. */
export const instant = (label = "Enter a date and time") =>
  z.preprocess(
    (v) => {
      if (v instanceof Date) return v;
      if (typeof v !== "string" || v.trim() === "") return undefined;
      const text = v.trim();
      const withZone = /(?:Z|[+-]\d{2}:?\d{2})$/i.test(text) || !/T|\s\d/.test(text) ? text : `${text}Z`;
      const d = new Date(withZone.replace(" ", "T"));
      return Number.isNaN(d.getTime()) ? "invalid" : d;
    },
    z
      .date({ required_error: label, invalid_type_error: `${label} as YYYY-MM-DDTHH:MM` })
      .min(new Date(Date.UTC(FIRST_YEAR, 0, 1)), `must be in ${FIRST_YEAR} or later`)
      .max(new Date(Date.UTC(LAST_YEAR + 1, 0, 1) - 1), `must be in ${LAST_YEAR} or earlier`),
  );

/**
 * A moment typed in a form as the facility's wall-clock time ("YYYY-MM-DDTHH:MM", a datetime-local
 * input), read in `timeZone` by `parseLocalDateTime`: a time the clocks skip is refused with the
 * reason, a repeated one is its first occurrence, a text with an offset is read as it says.
 */
export const localInstant = (label: string, timeZone: string) =>
  z.preprocess((v, ctx) => {
    if (v instanceof Date) return v;
    if (typeof v !== "string" || v.trim() === "") return undefined;
    const reading = parseLocalDateTime(v, timeZone);
    if (reading.ok) return reading.instant;
    ctx.addIssue({ code: z.ZodIssueCode.custom, message: reading.message });
    return z.NEVER;
  }, instant(label));

/**
 * A day, YYYY-MM-DD, that exists in the calendar, in FIRST_YEAR…LAST_YEAR. `label` is the message
 * when the day is missing (like `id` and `instant`); the API prefixes every message with the field.
 */
export const day = (label = "give a day as YYYY-MM-DD") =>
  z
    .string({ required_error: label })
    .regex(/^\d{4}-\d{2}-\d{2}$/, "give a day as YYYY-MM-DD")
    .refine(
      (v) => !Number.isNaN(Date.parse(`${v}T00:00:00Z`)) && new Date(`${v}T00:00:00Z`).toISOString().startsWith(v),
      "is not a calendar day",
    )
    .refine((v) => Number(v.slice(0, 4)) >= FIRST_YEAR && Number(v.slice(0, 4)) <= LAST_YEAR, `must be in ${FIRST_YEAR}–${LAST_YEAR}`);

export const CHANNELS = ["A", "B", "C", "D"] as const;
export type Channel = (typeof CHANNELS)[number];

/** A client-chosen key that makes a repeated submit record once. */
export const idempotencyKey = z
  .string({ required_error: "is missing (reload the form)" })
  .min(8, "is too short")
  .max(80, "is too long")
  .regex(/^[A-Za-z0-9_:-]+$/, "may hold letters, digits, _ : - only");

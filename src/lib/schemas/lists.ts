import { z } from "zod";

/**
 * The query every paged list takes: `limit` 1–500, the opaque `cursor` of the next page, a search
 * text `q`, a `sort` among the list's shown columns and its direction, and `format=csv` for an
 * export of every matching row. A list's own filters extend this object.
 */
export const listQuery = z.object({
  limit: z.coerce.number().int().min(1).max(500).default(50),
  cursor: z.string().max(500).optional(),
  q: z
    .string()
    .trim()
    .max(100)
    .transform((v) => (v === "" ? undefined : v))
    .optional(),
  sort: z.string().max(40).optional(),
  dir: z.enum(["asc", "desc"]).optional(),
  format: z.enum(["json", "csv"]).default("json"),
});

export type ListQuery = z.infer<typeof listQuery>;

/** An optional filter from a query string or a GET form: an empty field means "any". */
export const anyOr = <T extends z.ZodTypeAny>(schema: T) => z.preprocess((v) => (v === "" ? undefined : v), schema.optional());

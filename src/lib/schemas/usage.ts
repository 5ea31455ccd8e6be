import { z } from "zod";
import { day } from "./fields";

const MAX_DAYS = 3 * 366;

/** `GET /api/usage`: a period (both days included, UTC) and a grouping. */
export const usageQuery = z
  .object({
    from: day("from"),
    to: day("to"),
    groupBy: z.enum(["project"], { errorMap: () => ({ message: "must be project" }) }).default("project"),
  })
  .strict()
  .refine((v) => v.from <= v.to, { path: ["to"], message: "must not be before from" })
  .refine((v) => (Date.parse(v.to) - Date.parse(v.from)) / 86_400_000 <= MAX_DAYS, { path: ["to"], message: `the period may span at most ${MAX_DAYS} days` });
export type UsageQuery = z.infer<typeof usageQuery>;

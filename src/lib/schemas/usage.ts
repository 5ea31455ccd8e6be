import { z } from "zod";
import { day } from "./fields";
import { USAGE_GROUPINGS, type UsageGrouping } from "../ledger/usage-groupings";

const MAX_DAYS = 3 * 366;

export { USAGE_GROUPINGS, type UsageGrouping };

/** `GET /api/usage`: a period (both days included, UTC) and a grouping. */
export const usageQuery = z
  .object({
    from: day(),
    to: day(),
    groupBy: z.enum(USAGE_GROUPINGS, { errorMap: () => ({ message: `must be one of ${USAGE_GROUPINGS.join(", ")}` }) }).default("project"),
    /** "1": add each project's mobile-phase volumes to the project grouping (the other groupings always have them). */
    phases: z.enum(["0", "1"], { errorMap: () => ({ message: "must be 0 or 1" }) }).optional(),
  })
  .strict()
  .refine((v) => v.from <= v.to, { path: ["to"], message: "must not be before from" })
  .refine((v) => (Date.parse(v.to) - Date.parse(v.from)) / 86_400_000 <= MAX_DAYS, {
    path: ["to"],
    message: `the period may span at most ${MAX_DAYS} days`,
  });
export type UsageQuery = z.infer<typeof usageQuery>;

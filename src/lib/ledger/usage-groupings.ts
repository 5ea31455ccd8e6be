/** The groupings of `GET /api/usage`; `project` is the fixed contract's. Kept free of zod so the usage island stays light. */
export const USAGE_GROUPINGS = ["project", "client", "instrument", "reagent", "month"] as const;
export type UsageGrouping = (typeof USAGE_GROUPINGS)[number];

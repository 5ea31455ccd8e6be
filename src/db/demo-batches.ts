// The demo facility's batches, made as a lab would: acidified water every six days, the
// acetonitrile mix every four weeks, phosphate buffer when a method needs it. Each batch's code is
// its preparation day, its expiry comes from the expiry rules (the same function as a recorded
// batch), its lots were in date on the day it was made, and it has a row per bottle.
import { batchCodeBase, nextBatchCode } from "../lib/preparation/batch-code";
import { batchExpiry, DEFAULT_EXPIRY_RULES, type ExpiryBasis } from "../lib/preparation/expiry";
import { mixtureKind } from "../lib/preparation/mixture-kind";
import { recipeSpecSchema } from "../lib/schemas/recipes";
import { DEMO_RECIPE_SPECS } from "./demo-recipes";

export type DemoStatus = "ready" | "in_use" | "empty" | "discarded";

export interface DemoBatch {
  id: number;
  recipeVersionId: 1 | 2 | 3;
  daysAgo: number;
  status: DemoStatus;
  /** Left in the bottles now; historical batches are used up or were discarded. */
  remaining?: number;
}

const SPEC_OF = { 1: DEMO_RECIPE_SPECS["MP-FA-W"], 2: DEMO_RECIPE_SPECS["MP-FA-ACN"], 3: DEMO_RECIPE_SPECS["MP-PHOS-30"] } as const;

/** Ids 1–6 keep their long-standing roles (tests and the demo tour refer to them); older ones follow from 7. */
export function demoBatchSchedule(): { batches: DemoBatch[]; forRun: (daysAgo: number) => { A: number; B: number } } {
  const batches: DemoBatch[] = [
    { id: 1, recipeVersionId: 1, daysAgo: 91, status: "empty" },
    { id: 2, recipeVersionId: 2, daysAgo: 91, status: "empty" },
    { id: 3, recipeVersionId: 3, daysAgo: 40, status: "discarded" },
    { id: 4, recipeVersionId: 1, daysAgo: 5, status: "in_use" },
    { id: 5, recipeVersionId: 2, daysAgo: 5, status: "in_use" },
    { id: 6, recipeVersionId: 3, daysAgo: 1, status: "ready", remaining: 1000 },
  ];
  let next = 7;
  for (let day = 85; day > 5; day -= 6) batches.push({ id: next++, recipeVersionId: 1, daysAgo: day, status: "empty" });
  for (let day = 63; day > 5; day -= 28) batches.push({ id: next++, recipeVersionId: 2, daysAgo: day, status: "empty" });
  const latest = (version: 1 | 2, daysAgo: number) =>
    batches.filter((b) => b.recipeVersionId === version && b.daysAgo >= daysAgo).sort((a, b) => a.daysAgo - b.daysAgo)[0]!.id;
  return { batches, forRun: (daysAgo) => ({ A: latest(1, daysAgo), B: latest(2, daysAgo) }) };
}

/** Codes from the preparation instants, in order, as the service allots them. */
export function demoCodes(prepared: { id: number; at: Date }[]): Map<number, string> {
  const taken: string[] = [];
  const codes = new Map<number, string>();
  for (const p of [...prepared].sort((a, b) => a.at.getTime() - b.at.getTime() || a.id - b.id)) {
    const code = nextBatchCode(batchCodeBase(p.at), taken);
    taken.push(code);
    codes.set(p.id, code);
  }
  return codes;
}

/** Expiry from the facility's rules (the seeded settings are the defaults) and the lots in it. */
export function demoExpiry(
  recipeVersionId: 1 | 2 | 3 | 4,
  preparedAt: Date,
  lots: { lotNumber: string; expiresOn: string }[],
): { expiresAt: Date; reason: string; basis: ExpiryBasis } {
  const spec = recipeSpecSchema.parse(recipeVersionId === 4 ? DEMO_RECIPE_SPECS["MP-AMF-35"] : SPEC_OF[recipeVersionId as 1 | 2 | 3]);
  const { expiresAt, reason, basis } = batchExpiry({ kind: mixtureKind(spec), preparedAt, rules: DEFAULT_EXPIRY_RULES, lots });
  return { expiresAt, reason, basis };
}

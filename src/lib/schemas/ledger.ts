import { z } from "zod";
import { id, optionalId } from "./fields";

/** `POST /api/ledger/corrections`: reverse entries (never edit them). */
export const correctionSchema = z
  .object({
    /** The entries to reverse. */
    entryIds: z
      .array(id("must be an entry id"), { invalid_type_error: "must be a list of entry ids" })
      .max(500, "at most 500 entries at once")
      .default([]),
    /** Or every entry a run wrote that is not yet reversed. */
    runId: optionalId(),
    /** Why: kept with the reversing entry and in the audit log. */
    reason: z.string({ required_error: "Say why the entry is wrong" }).trim().min(3, "Say why the entry is wrong").max(255, "is too long"),
  })
  .refine((v) => v.entryIds.length > 0 || v.runId !== undefined, {
    path: ["entryIds"],
    message: "Choose the entries (or the run) to reverse",
  });
export type CorrectionInput = z.infer<typeof correctionSchema>;

/** `GET /api/ledger` query. */
export const ledgerListQuery = z
  .object({
    runId: optionalId(),
    batchId: optionalId(),
    limit: z.coerce.number().int().min(1).max(1000).default(200),
  })
  .strict();

import { z } from "zod";
import { anyOr, listQuery } from "./lists";
import { getReagent } from "../chem/reagents";
import { day } from "./fields";
const blankToUndefined = (v: unknown) => (v === "" || v === null ? undefined : v);

/** A stock lot as received (multipart form fields of `POST /api/stock-lots`). */
export const stockLotInputSchema = z
  .object({
    reagent: z
      .string({ required_error: "Pick the reagent" })
      .min(1, "Pick the reagent")
      .max(64, "Unknown reagent")
      .refine((id) => getReagent(id) !== undefined, "Unknown reagent"),
    lotNumber: z.string({ required_error: "Give the lot number" }).trim().min(1, "Give the lot number").max(64, "At most 64 characters"),
    supplier: z.string({ required_error: "Name the supplier" }).trim().min(1, "Name the supplier").max(120),
    grade: z.string({ required_error: "Give the grade" }).trim().min(1, "Give the grade, e.g. HPLC or LC-MS").max(40),
    receivedOn: day("Give the date received"),
    openedOn: z.preprocess(blankToUndefined, day().optional()),
    expiresOn: day("Give the expiry date"),
    /** In mL for liquids, g for solids. */
    quantity: z.coerce.number({ invalid_type_error: "Quantity must be a number" }).positive("Quantity must be more than 0").max(10_000_000),
    remaining: z.preprocess(
      blankToUndefined,
      z.coerce.number({ invalid_type_error: "Remaining must be a number" }).min(0, "Cannot be negative").optional(),
    ),
    room: z.preprocess(blankToUndefined, z.string().trim().max(40).optional()),
  })
  .strict()
  .superRefine((lot, ctx) => {
    if (lot.expiresOn < lot.receivedOn)
      ctx.addIssue({ code: "custom", path: ["expiresOn"], message: "The expiry date is before the date received" });
    if (lot.openedOn && lot.openedOn < lot.receivedOn)
      ctx.addIssue({ code: "custom", path: ["openedOn"], message: "Opened before it was received?" });
    if (lot.remaining !== undefined && lot.remaining > lot.quantity)
      ctx.addIssue({ code: "custom", path: ["remaining"], message: "More remaining than was received" });
  });
export type StockLotInput = z.infer<typeof stockLotInputSchema>;

/** `GET /api/stock-lots` and `/stock-lots`: a page, a search (lot number, supplier, reagent), a sort, and the filters. */
export const stockLotListQuery = listQuery
  .extend({
    reagent: anyOr(z.string().max(64)),
    /** `usable`: in date and not used up (what a batch may take from). */
    state: z.preprocess((v) => (v === "" ? undefined : v), z.enum(["all", "usable", "expired", "low"]).default("all")),
  })
  .strict();
export type StockLotListQuery = z.infer<typeof stockLotListQuery>;

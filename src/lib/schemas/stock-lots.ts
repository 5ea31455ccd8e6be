import { z } from "zod";
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
    /** Assay from the certificate of analysis: % w/w of the formula substance (for a solution, as received). */
    assayPercent: z.preprocess(
      blankToUndefined,
      z.coerce
        .number({ invalid_type_error: "Assay must be a number (% w/w)" })
        .gt(0, "Assay: more than 0 %")
        .max(100, "Assay: at most 100 %")
        .optional(),
    ),
    /** Density at 20 °C from the certificate (solutions), g/mL. */
    density_g_mL: z.preprocess(
      blankToUndefined,
      z.coerce
        .number({ invalid_type_error: "Density must be a number (g/mL)" })
        .min(0.5, "Density: 0.5–2.5 g/mL")
        .max(2.5, "Density: 0.5–2.5 g/mL")
        .optional(),
    ),
  })
  .strict()
  .superRefine((lot, ctx) => {
    if (lot.density_g_mL !== undefined && getReagent(lot.reagent)?.form === "solid")
      ctx.addIssue({ code: "custom", path: ["density_g_mL"], message: "A solid has no density to record; leave it empty" });
    if (lot.expiresOn < lot.receivedOn)
      ctx.addIssue({ code: "custom", path: ["expiresOn"], message: "The expiry date is before the date received" });
    if (lot.openedOn && lot.openedOn < lot.receivedOn)
      ctx.addIssue({ code: "custom", path: ["openedOn"], message: "Opened before it was received?" });
    if (lot.remaining !== undefined && lot.remaining > lot.quantity)
      ctx.addIssue({ code: "custom", path: ["remaining"], message: "More remaining than was received" });
  });
export type StockLotInput = z.infer<typeof stockLotInputSchema>;

export const stockLotListQuery = z
  .object({
    reagent: z.string().max(64).optional(),
    q: z.string().trim().max(64).optional(),
    /** `usable`: in date and not used up (what a batch may take from). */
    state: z.enum(["all", "usable", "expired", "low"]).default("all"),
  })
  .strict();

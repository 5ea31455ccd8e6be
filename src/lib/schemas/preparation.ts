import { z } from "zod";
import { id, idempotencyKey, idParam } from "./fields";
import { MIXTURE_KINDS } from "../preparation/expiry";
import { labelStockListSchema } from "./labels";

/** One row of the expiry rule table. */
export const expiryRuleSchema = z.object({
  kind: z.enum(MIXTURE_KINDS),
  label: z.string().trim().min(3, "Give the rule a name").max(80),
  shelfLife_h: z.coerce
    .number({ invalid_type_error: "Shelf life must be a number of hours" })
    .int("Whole hours")
    .min(1, "At least 1 h")
    .max(24 * 366, "At most a year"),
  reason: z.string().trim().min(5, "Say why (shown to the technician)").max(300),
});

export const tolerancesSchema = z.object({
  pH: z.coerce.number({ invalid_type_error: "pH tolerance must be a number" }).min(0.001, "At least 0.001").max(1, "At most 1 pH unit"),
  amount_percent: z.coerce
    .number({ invalid_type_error: "Amount tolerance must be a number" })
    .min(0.1, "At least 0.1 %")
    .max(20, "At most 20 %"),
});

export const preparationSettingsSchema = z
  .object({
    expiryRules: z.array(expiryRuleSchema).length(MIXTURE_KINDS.length, `One rule for each kind: ${MIXTURE_KINDS.join(", ")}`),
    tolerances: tolerancesSchema,
    labelStocks: labelStockListSchema,
    defaultLabelStockId: z.string().min(1),
  })
  .superRefine((s, ctx) => {
    const kinds = new Set(s.expiryRules.map((r) => r.kind));
    if (kinds.size !== MIXTURE_KINDS.length)
      ctx.addIssue({ code: "custom", path: ["expiryRules"], message: "Each kind of mobile phase needs exactly one rule" });
    if (!s.labelStocks.some((st) => st.id === s.defaultLabelStockId))
      ctx.addIssue({ code: "custom", path: ["defaultLabelStockId"], message: "The default stock must be one of the stocks" });
  });
export type PreparationSettings = z.infer<typeof preparationSettingsSchema>;

const amount = z.preprocess(
  (v) => (v === "" || v === null || v === undefined || (typeof v === "number" && Number.isNaN(v)) ? null : v),
  z.coerce
    .number({ invalid_type_error: "Give a number" })
    .min(0, "Cannot be negative")
    .max(1_000_000, "At most 1,000,000 (1,000 L or kg)")
    .nullable(),
);

/** `POST /api/batches`: what the preparation form sends. Targets are recomputed on the server. */
export const batchCreateSchema = z
  .object({
    /** Made once per form; a second submit with the same key answers the batch already recorded. */
    idempotencyKey,
    recipeVersionId: id("Pick a recipe"),
    volume_mL: z.coerce
      .number({ invalid_type_error: "Give the batch volume" })
      .positive("The batch volume must be more than 0")
      .max(100_000, "At most 100 L in one batch"),
    bottles: z.coerce
      .number({ invalid_type_error: "Give the number of bottles" })
      .int("Whole bottles")
      .min(1, "At least one bottle")
      .max(50, "At most 50 bottles"),
    bottleSize_mL: z.coerce
      .number({ invalid_type_error: "Give the bottle size" })
      .int("Whole millilitres")
      .min(10, "At least 10 mL")
      .max(25_000, "At most 25 L"),
    /** Temperature at which the batch is made. */
    temperature_C: z.coerce.number({ invalid_type_error: "Give the temperature" }).min(5, "5–40 °C").max(40, "5–40 °C").default(22),
    measuredPH: z
      .preprocess(
        (v) => (v === "" || (typeof v === "number" && Number.isNaN(v)) ? null : v),
        z.coerce.number({ invalid_type_error: "pH must be a number" }).min(0, "pH 0–14").max(14, "pH 0–14").nullable(),
      )
      .optional(),
    phMeterTemperature_C: z
      .preprocess(
        (v) => (v === "" || (typeof v === "number" && Number.isNaN(v)) ? null : v),
        z.coerce.number().min(0, "0–50 °C").max(50, "0–50 °C").nullable(),
      )
      .optional(),
    components: z
      .array(
        z.object({
          reagent: z.string().min(1).max(64),
          /** The stock lot it came from; required for every component. */
          stockLotId: id("Pick the lot used"),
          /** What was actually weighed or measured, in mL (liquids) or g (solids). */
          actualAmount: amount.optional(),
        }),
      )
      .min(1, "List the components")
      .max(30, "At most 30 components"),
    deviationReason: z.string().trim().max(500, "At most 500 characters").optional(),
    /** The room the batch is kept in (counted in its flammables on hand); the first known room when left out. */
    room: z.preprocess(
      (v) => (v === "" || v === null ? undefined : v),
      z.string().trim().min(1).max(40, "At most 40 characters").optional(),
    ),
  })
  .strict()
  .superRefine((b, ctx) => {
    if (b.bottles * b.bottleSize_mL < b.volume_mL)
      ctx.addIssue({
        code: "custom",
        path: ["bottleSize_mL"],
        message: `${b.bottles} × ${b.bottleSize_mL} mL bottles cannot hold ${b.volume_mL} mL`,
      });
  });
export type BatchCreateInput = z.infer<typeof batchCreateSchema>;

/** `POST /api/batches/{id}/bottles/{n}`. */
/** A change of state, or `undo: true`: take back the last "empty" or "discarded" within the undo window (`lib/undo.ts`). */
export const bottleUpdateSchema = z
  .object({
    status: z.enum(["in_use", "empty", "discarded"]).optional(),
    /** For "discarded": what was left in the bottle (mL), sent to waste. */
    discarded_mL: z.coerce.number().min(0, "Cannot be negative").max(25_000).optional(),
    reason: z.string().trim().max(255).optional(),
    undo: z.literal(true).optional(),
  })
  .strict()
  .refine((b) => (b.status === undefined) !== (b.undo === undefined), {
    message: "Give either a new status or undo: true",
    path: ["status"],
  });

export const batchLookupQuery = z.object({ code: z.string().trim().min(2, "Type or scan a batch code").max(40) }).strict();

/** `/api/batches/{id}/bottles/{number}`. */
export const bottleParams = idParam.extend({ number: id("must be a positive whole number") });
export const approveSchema = z.object({ version: z.coerce.number().int().positive("version: give the version you reviewed") }).strict();

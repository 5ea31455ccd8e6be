import { z } from "zod";
import { ORGANIC_MODIFIERS } from "../chem/substitution";
import { amount, CHANNELS, id, wholeNumber } from "./fields";

const modifier = z.enum(ORGANIC_MODIFIERS, { errorMap: () => ({ message: `choose ${ORGANIC_MODIFIERS.join(", ")}` }) });

/** The new organic: one modifier, or a blend in percent of the organic channel. */
const target = z.union([
  modifier,
  z
    .object({
      acetonitrile: amount({ max: 100 }).optional(),
      methanol: amount({ max: 100 }).optional(),
      tetrahydrofuran: amount({ max: 100 }).optional(),
    })
    .strict()
    .refine(
      (b) => Math.abs((b.acetonitrile ?? 0) + (b.methanol ?? 0) + (b.tetrahydrofuran ?? 0) - 100) < 1e-6,
      "the blend must add up to 100 %",
    ),
]);

export const substitutionSchema = z
  .object({
    from: modifier,
    to: target,
    channel: z.enum(CHANNELS).default("B"),
    aqueous: z.enum(CHANNELS).default("A"),
  })
  .strict()
  .refine((s) => s.channel !== s.aqueous, { path: ["aqueous"], message: "must differ from the organic channel" })
  .refine((s) => typeof s.to !== "string" || s.to !== s.from, { path: ["to"], message: "choose a solvent other than the current one" });

export const columnSchema = z
  .object({
    length_mm: amount({ min: 5, max: 1000 }),
    diameter_mm: amount({ min: 0.05, max: 50 }),
    particle_um: amount({ min: 0.5, max: 50 }),
    dwell_mL: amount({ min: 0, max: 20 }),
  })
  .strict();

export const transferSchema = z
  .object({
    from: columnSchema,
    to: columnSchema,
    keep: z.enum(["linear-velocity", "reduced-velocity"]).default("linear-velocity"),
    injection_uL: amount({ min: 0, max: 10_000 }),
  })
  .strict();

export const scoutingSchema = z
  .object({
    runs: z
      .array(z.object({ percentB: amount({ max: 100 }), retention_min: amount({ max: 1440 }) }).strict())
      .min(2, "give at least two scouting runs")
      .max(10),
    deadTime_min: amount({ min: 0.001, max: 120 }),
  })
  .strict();

const reagentId = z
  .string()
  .trim()
  .min(1)
  .max(64)
  .regex(/^[a-z0-9-]+$/, "is not a reagent id");

/** `POST /api/planning/preview` and `POST /api/planning/variants`: what a variant changes. */
export const variantSchema = z
  .object({
    methodId: id("choose a method"),
    name: z.string().trim().max(120, "is too long").optional(),
    substitution: substitutionSchema.optional(),
    transfer: transferSchema.optional(),
    detection_nm: wholeNumber({ min: 180, max: 900 }).optional(),
    /** The solvent on each channel, when the ledger does not say (a method never run). */
    solvents: z.record(z.enum(CHANNELS), reagentId).optional(),
    scouting: scoutingSchema.optional(),
  })
  .strict()
  .refine((v) => v.substitution || v.transfer, { path: ["substitution"], message: "choose a solvent change, a column change or both" });
export type VariantInput = z.infer<typeof variantSchema>;
export type VariantParams = Omit<VariantInput, "methodId" | "name">;

/** `POST /api/planning/variants/{id}/submit`: a note for the approver. */
export const submitVariantSchema = z.object({ note: z.string().trim().max(255, "is too long").optional() }).strict();

/** `POST /api/planning/versions/{id}`: the manager's decision on a pending method version. */
export const versionDecisionSchema = z.object({ decision: z.enum(["approve", "reject"]) }).strict();

/** `PUT /api/planning/supply`: one reagent's lead time and safety stock. */
export const supplySettingSchema = z
  .object({
    reagentId,
    leadTime_days: wholeNumber({ min: 0, max: 365 }),
    safetyStock: amount({ min: 0, max: 10_000_000 }),
  })
  .strict();
export type SupplySettingInput = z.infer<typeof supplySettingSchema>;

/** `GET /api/planning/variants?methodId=`. */
export const variantsQuerySchema = z.object({ methodId: id("choose a method") });

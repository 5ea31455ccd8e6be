import { z } from "zod";
import { ADDITIVE_UNITS } from "../chem/additive-units";
import { getReagent } from "../chem/reagents";
import { SHELF_LIFE_IN_TEXT } from "../preparation/expiry";

const reagentId = (what: string) =>
  z
    .string({ required_error: `Pick a ${what}` })
    .min(1, `Pick a ${what}`)
    .max(64, `Unknown ${what}`)
    .refine((id) => getReagent(id) !== undefined, { message: `Unknown ${what}` });

/** The mobile-phase specification of one recipe version (stored as JSON, snapshotted into each batch). */
export const recipeSpecSchema = z
  .object({
    /** Solvents, v/v %, each measured separately before mixing; they add up to 100. */
    solvents: z
      .array(
        z.object({
          reagent: reagentId("solvent"),
          percent: z.coerce.number({ invalid_type_error: "Give a percentage" }).min(0, "At least 0 %").max(100, "At most 100 %"),
        }),
      )
      .min(1, "Add at least one solvent")
      .max(4, "At most four solvents"),
    /** A buffer made in the aqueous part: concentration is per litre of the water portion. */
    buffer: z
      .object({
        reagents: z.tuple([reagentId("buffer reagent"), reagentId("second buffer reagent")]),
        targetPH: z.coerce.number({ invalid_type_error: "Give the target pH" }).min(0, "pH 0–14").max(14, "pH 0–14"),
        concentration_mM: z.coerce
          .number({ invalid_type_error: "Give the concentration" })
          .positive("More than 0 mM")
          .max(500, "At most 500 mM"),
        basis: z.enum(["first", "total"]),
        /** Temperature at which the pH is set. */
        temperature_C: z.coerce.number().min(0, "0–50 °C").max(50, "0–50 °C").default(25),
      })
      .optional(),
    /** Additives per litre of the finished mix. */
    additives: z
      .array(
        z.object({
          reagent: reagentId("additive"),
          amount: z.coerce
            .number({ invalid_type_error: "Give an amount" })
            .positive("More than 0")
            .max(1_000_000, "That amount is implausibly large"),
          unit: z.enum(ADDITIVE_UNITS),
        }),
      )
      .max(6)
      .default([]),
    /** Contains something that degrades quickly (shortest expiry rule applies). */
    labile: z.boolean().default(false),
  })
  .superRefine((spec, ctx) => {
    const sum = spec.solvents.reduce((a, s) => a + s.percent, 0);
    if (Math.abs(sum - 100) > 1e-6)
      ctx.addIssue({ code: "custom", path: ["solvents"], message: `Solvent percentages add up to ${+sum.toFixed(3)} %, not 100 %` });
    spec.solvents.forEach((s, i) => {
      if (getReagent(s.reagent)?.form !== "liquid")
        ctx.addIssue({ code: "custom", path: ["solvents", i, "reagent"], message: "A solvent must be a liquid" });
    });
    if (spec.buffer && !spec.solvents.some((s) => s.reagent === "water" && s.percent > 0)) {
      ctx.addIssue({ code: "custom", path: ["buffer"], message: "A buffer needs water among the solvents" });
    }
  });

export type RecipeSpec = z.infer<typeof recipeSpecSchema>;
export type RecipeSpecInput = z.input<typeof recipeSpecSchema>;

/** Create or edit a recipe (editing an approved version makes a new version). */
export const recipeInputSchema = z.object({
  name: z.string().trim().min(3, "Give the recipe a name (3–160 characters)").max(160, "At most 160 characters"),
  /** Short code, e.g. MP-FA-W; made from the name when left empty. */
  code: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9][A-Z0-9-]{1,30}$/, "2–31 letters, digits and dashes")
    .optional()
    .or(z.literal("").transform(() => undefined)),
  channel: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-D]$/, "Channel A, B, C or D")
    .nullable()
    .optional()
    .or(z.literal("").transform(() => null)),
  detection_nm: z.coerce.number().int("Whole nanometres").min(190, "190–800 nm").max(800, "190–800 nm").nullable().optional(),
  storage: z
    .string()
    .trim()
    .max(160, "At most 160 characters")
    .refine(
      (text) => !SHELF_LIFE_IN_TEXT.test(text),
      "Conditions only (temperature, light, container): the shelf life comes from the expiry rules",
    )
    .nullable()
    .optional(),
  notes: z.string().trim().max(4000).nullable().optional(),
  spec: recipeSpecSchema,
});
export type RecipeInput = z.infer<typeof recipeInputSchema>;

export const recipeListQuery = z
  .object({
    q: z.string().trim().max(80).optional(),
    status: z.enum(["approved", "pending", "retired"]).optional(),
    channel: z
      .string()
      .regex(/^[A-D]$/)
      .optional(),
    sort: z.enum(["code", "name", "channel", "version", "updated"]).default("code"),
    dir: z.enum(["asc", "desc"]).default("asc"),
  })
  .strict();

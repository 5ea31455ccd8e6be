import { z } from "zod";
import { day, id } from "./fields";

/** A new rate. Rates are never edited; a later effective-from supersedes the old price. */
export const rateInput = z
  .object({
    /** What is priced: a reagent by volume or mass, or a per-batch / per-injection fee. */
    kind: z.enum(["reagent", "preparation_fee", "injection_fee"], {
      errorMap: () => ({ message: "Choose reagent, preparation_fee or injection_fee" }),
    }),
    /** Catalogue id of the reagent (kind "reagent" only). */
    reagentId: z.string().trim().min(1).max(64).optional(),
    /** A grade-specific price, e.g. "LC-MS"; left out for the reagent's general price. */
    grade: z.string().trim().min(1).max(40).optional(),
    /** Internal research groups or external clients. */
    priceList: z.enum(["internal", "external"], { errorMap: () => ({ message: "Choose internal or external" }) }),
    /** L or g for reagents, batch for the preparation fee, injection for the injection fee. */
    unit: z.enum(["L", "g", "batch", "injection"]),
    /** Price per unit in integer minor units (cents): 4200 is €42.00. */
    amount_minor: z
      .number({ invalid_type_error: "Enter the price in minor units (cents)" })
      .int("Enter whole minor units (cents)")
      .min(0, "A price cannot be negative")
      .max(100_000_000, "That price is implausibly high"),
    /** ISO 4217 code. */
    currency: z.string().regex(/^[A-Z]{3}$/, "Use a three-letter currency code such as EUR"),
    /** First day the price applies (UTC). */
    effectiveFrom: day(),
  })
  .strict()
  .superRefine((rate, ctx) => {
    if (rate.kind === "reagent" && !rate.reagentId)
      ctx.addIssue({ code: "custom", path: ["reagentId"], message: "Choose the reagent this price is for" });
    if (rate.kind !== "reagent" && rate.reagentId)
      ctx.addIssue({ code: "custom", path: ["reagentId"], message: "Fees are not per reagent; leave the reagent out" });
    if (rate.kind !== "reagent" && rate.grade) ctx.addIssue({ code: "custom", path: ["grade"], message: "Fees have no grade" });
    const expected = { reagent: ["L", "g"], preparation_fee: ["batch"], injection_fee: ["injection"] }[rate.kind];
    if (!expected.includes(rate.unit))
      ctx.addIssue({ code: "custom", path: ["unit"], message: `A ${rate.kind.replace("_", " ")} is priced per ${expected.join(" or ")}` });
  });
export type RateInput = z.infer<typeof rateInput>;

/** A client's period; months by default. */
export const statementOpenInput = z
  .object({
    clientId: id("Choose a client"),
    periodStart: day(),
    periodEnd: day(),
  })
  .strict()
  .refine((p) => p.periodEnd >= p.periodStart, { path: ["periodEnd"], message: "periodEnd must be on or after periodStart" });
export type StatementOpenInput = z.infer<typeof statementOpenInput>;

/** Issuing or invoicing a draft: the total the manager reviewed, so a changed ledger is noticed. */
export const statementIssueInput = z
  .object({
    expectedTotal_minor: z.number().int().optional(),
  })
  .strict();

/** `?month=YYYY-MM` on the statements screen. */
export const monthQuery = z.object({
  month: z
    .string()
    .regex(/^\d{4}-(0[1-9]|1[0-2])$/, "month must look like 2026-11")
    .optional(),
});

/** `?from=&to=` for the chargeback journal. */
export const journalQuery = z
  .object({ from: day(), to: day() })
  .refine((q) => q.to >= q.from, { path: ["to"], message: "to must be on or after from" });

import { z } from "zod";

const pct = (name: string) =>
  z.preprocess(
    (v) => (v === "" || v === undefined ? 0 : typeof v === "string" ? Number(v) : v),
    z
      .number({ invalid_type_error: `${name}: enter a percentage` })
      .finite()
      .min(0, `${name} must be 0–100`)
      .max(100, `${name} must be 0–100`),
  );

/** One row of the gradient table; %A is what B, C and D leave. */
export const programRowSchema = z
  .object({
    time_min: z.preprocess(
      (v) => (typeof v === "string" && v !== "" ? Number(v) : v),
      z
        .number({ required_error: "Enter a time", invalid_type_error: "Enter a time" })
        .finite()
        .min(0, "must be 0 or more")
        .max(1440, "must be at most 1440 min"),
    ),
    flow_mL_min: z.preprocess(
      (v) => (typeof v === "string" && v !== "" ? Number(v) : v),
      z
        .number({ required_error: "Enter a flow", invalid_type_error: "Enter a flow" })
        .finite()
        .min(0, "must be 0 or more")
        .max(20, "must be at most 20 mL/min"),
    ),
    B: pct("%B"),
    C: pct("%C"),
    D: pct("%D"),
  })
  .refine((r) => r.B + r.C + r.D <= 100 + 1e-9, { path: ["B"], message: "%B + %C + %D must not exceed 100" });
export type ProgramRow = z.infer<typeof programRowSchema>;

/** `POST /api/methods`, `PUT /api/methods/{id}`. */
export const methodSchema = z
  .object({
    name: z.string({ required_error: "Enter a name" }).trim().min(1, "Enter a name").max(120, "is too long"),
    description: z.string().trim().max(2000, "is too long").default(""),
    rows: z.array(programRowSchema).min(2, "A program needs at least two rows").max(100, "at most 100 rows"),
    /** Re-equilibration at the end of the program, min (part of the program's last rows). */
    reEquilibration_min: z
      .preprocess((v) => (v === "" ? 0 : typeof v === "string" ? Number(v) : v), z.number().finite().min(0).max(1440))
      .default(0),
  })
  .superRefine((m, ctx) => {
    if (m.rows[0] && m.rows[0].time_min !== 0)
      ctx.addIssue({ code: "custom", path: ["rows", 0, "time_min"], message: "The program starts at 0 min" });
    m.rows.forEach((r, i) => {
      const prev = m.rows[i - 1];
      if (prev && r.time_min < prev.time_min)
        ctx.addIssue({ code: "custom", path: ["rows", i, "time_min"], message: `must not be earlier than row ${i}` });
    });
    const last = m.rows[m.rows.length - 1];
    if (last && last.time_min <= 0)
      ctx.addIssue({ code: "custom", path: ["rows", m.rows.length - 1, "time_min"], message: "The program must last longer than 0 min" });
  });
export type MethodInput = z.infer<typeof methodSchema>;

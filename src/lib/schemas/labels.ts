import { z } from "zod";

const mm = (what: string, max = 400) =>
  z.coerce
    .number({ invalid_type_error: `${what} must be a number (mm)` })
    .positive(`${what} must be greater than 0 mm`)
    .max(max, `${what} must be at most ${max} mm`);

/** A label stock: a roll (one label per PDF page) or a sheet with a grid of labels. */
export const labelStockSchema = z
  .object({
    /** kebab-case id used in `?stock=` and in settings. */
    id: z.string().regex(/^[a-z0-9][a-z0-9-]{1,39}$/, "id: 2–40 lower-case letters, digits and dashes"),
    /** Name shown in the print dialog, e.g. "Roll, 100 × 50 mm". */
    name: z.string().trim().min(2, "Give the stock a name").max(80),
    kind: z.enum(["roll", "sheet"]),
    width_mm: mm("Label width", 300),
    height_mm: mm("Label height", 300),
    /** Sheets only: the page and its grid. */
    sheet: z
      .object({
        pageWidth_mm: mm("Page width"),
        pageHeight_mm: mm("Page height"),
        columns: z.coerce.number().int().min(1).max(10),
        rows: z.coerce.number().int().min(1).max(30),
        marginLeft_mm: z.coerce.number().min(0).max(100),
        marginTop_mm: z.coerce.number().min(0).max(100),
        gapX_mm: z.coerce.number().min(0).max(50).default(0),
        gapY_mm: z.coerce.number().min(0).max(50).default(0),
      })
      .optional(),
  })
  .superRefine((stock, ctx) => {
    if (stock.kind === "sheet" && !stock.sheet)
      ctx.addIssue({ code: "custom", path: ["sheet"], message: "A sheet stock needs its page size and grid" });
    if (stock.width_mm < 40 || stock.height_mm < 20)
      ctx.addIssue({
        code: "custom",
        path: ["width_mm"],
        message: "Labels smaller than 40 × 20 mm cannot hold the batch code, dates and preparer legibly",
      });
    const s = stock.sheet;
    if (stock.kind === "sheet" && s) {
      const w = s.marginLeft_mm + s.columns * stock.width_mm + (s.columns - 1) * s.gapX_mm;
      const h = s.marginTop_mm + s.rows * stock.height_mm + (s.rows - 1) * s.gapY_mm;
      if (w > s.pageWidth_mm + 0.01)
        ctx.addIssue({ code: "custom", path: ["sheet", "columns"], message: `The grid is ${w.toFixed(1)} mm wide, wider than the page` });
      if (h > s.pageHeight_mm + 0.01)
        ctx.addIssue({ code: "custom", path: ["sheet", "rows"], message: `The grid is ${h.toFixed(1)} mm tall, taller than the page` });
    }
  });

export type LabelStock = z.infer<typeof labelStockSchema>;

export const labelStockListSchema = z
  .array(labelStockSchema)
  .min(1, "Keep at least one label stock")
  .max(30)
  .superRefine((list, ctx) => {
    const seen = new Set<string>();
    list.forEach((s, i) => {
      if (seen.has(s.id)) ctx.addIssue({ code: "custom", path: [i, "id"], message: `Two stocks share the id "${s.id}"` });
      seen.add(s.id);
    });
  });

/** `GET /api/batches/{id}/label.pdf` query. */
export const labelQuery = z
  .object({
    /** Number of labels; defaults to one per bottle. */
    copies: z.coerce
      .number({ invalid_type_error: "copies must be a whole number" })
      .int("copies must be a whole number")
      .min(1, "copies must be at least 1")
      .max(500, "copies must be at most 500")
      .optional(),
    /** Label stock id (see the settings); defaults to the facility's default stock. */
    stock: z.string().max(40).optional(),
    /** Print only this bottle's label (1-based), `copies` times. */
    bottle: z.coerce.number().int("bottle must be a whole number").min(1, "bottle must be at least 1").optional(),
    /** `inline` shows the PDF in the browser (print preview); otherwise it downloads. */
    disposition: z.enum(["inline", "attachment"]).default("attachment"),
  })
  .strict();

import { describe, expect, it } from "vitest";
import { labelQuery, labelStockSchema } from "../../../src/lib/schemas/labels";
import { batchCreateSchema } from "../../../src/lib/schemas/preparation";
import { recipeInputSchema } from "../../../src/lib/schemas/recipes";
import { stockLotInputSchema } from "../../../src/lib/schemas/stock-lots";
import { formatZodError } from "../../../src/lib/schemas/zod-error";
import { detectType } from "../../../src/lib/server/storage";

const message = (r: { success: boolean; error?: import("zod").ZodError }) => (r.success ? "" : formatZodError(r.error!));

describe("recipe schema", () => {
  const ok = {
    name: "Test phase",
    channel: "A",
    spec: {
      solvents: [
        { reagent: "water", percent: 60 },
        { reagent: "methanol", percent: 40 },
      ],
    },
  };
  it("accepts a sound recipe", () => expect(recipeInputSchema.safeParse(ok).success).toBe(true));
  it.each([
    [
      "solvents that do not add up",
      {
        ...ok,
        spec: {
          solvents: [
            { reagent: "water", percent: 60 },
            { reagent: "methanol", percent: 30 },
          ],
        },
      },
      /spec.solvents: .*90 %, not 100 %/,
    ],
    [
      "an unknown reagent",
      { ...ok, spec: { solvents: [{ reagent: "unobtainium", percent: 100 }] } },
      /spec.solvents.0.reagent: Unknown solvent/,
    ],
    [
      "a solid as a solvent",
      { ...ok, spec: { solvents: [{ reagent: "tris", percent: 100 }] } },
      /spec.solvents.0.reagent: A solvent must be a liquid/,
    ],
    [
      "a buffer without water",
      {
        ...ok,
        spec: {
          solvents: [{ reagent: "methanol", percent: 100 }],
          buffer: { reagents: ["ammonium-formate", "formic-acid"], targetPH: 3.5, concentration_mM: 10, basis: "first" },
        },
      },
      /spec.buffer: A buffer needs water/,
    ],
    ["a channel E", { ...ok, channel: "E" }, /channel: Channel A, B, C or D/],
  ])("refuses %s, naming the field", (_n, input, pattern) => {
    expect(message(recipeInputSchema.safeParse(input))).toMatch(pattern);
  });
});

describe("batch schema", () => {
  const ok = {
    idempotencyKey: "key-12345678",
    recipeVersionId: 1,
    volume_mL: 2000,
    bottles: 2,
    bottleSize_mL: 1000,
    components: [{ reagent: "water", stockLotId: 6, actualAmount: 2000 }],
  };
  it("accepts a sound batch and reads blank amounts as not recorded", () => {
    const parsed = batchCreateSchema.parse({ ...ok, components: [{ reagent: "water", stockLotId: 6, actualAmount: "" }], measuredPH: "" });
    expect(parsed.components[0]!.actualAmount).toBeNull();
    expect(parsed.measuredPH).toBeNull();
  });
  it.each([
    ["bottles too small for the volume", { ...ok, bottleSize_mL: 500 }, /bottleSize_mL: 2 × 500 mL bottles cannot hold 2000 mL/],
    ["no lot picked", { ...ok, components: [{ reagent: "water", stockLotId: 0 }] }, /components.0.stockLotId: Pick the lot used/],
    ["a pH of 15", { ...ok, measuredPH: 15 }, /measuredPH: pH 0–14/],
    ["an idempotency key of 3 characters", { ...ok, idempotencyKey: "abc" }, /idempotencyKey/],
    ["an unknown field", { ...ok, sneaky: 1 }, /Unrecognized key/],
  ])("refuses %s", (_n, input, pattern) => expect(message(batchCreateSchema.safeParse(input))).toMatch(pattern));
});

describe("stock lot schema", () => {
  const ok = {
    reagent: "acetonitrile",
    lotNumber: "AN-1",
    supplier: "Example Supplies",
    grade: "HPLC",
    receivedOn: "2026-11-01",
    expiresOn: "2028-11-01",
    quantity: "4000",
  };
  it("accepts form fields as strings", () => expect(stockLotInputSchema.parse(ok).quantity).toBe(4000));
  it.each([
    ["an expiry before receipt", { ...ok, expiresOn: "2026-10-01" }, /expiresOn: The expiry date is before/],
    ["a date in another format", { ...ok, receivedOn: "01/11/2026" }, /receivedOn: give a day as YYYY-MM-DD/],
    ["more remaining than received", { ...ok, remaining: "5000" }, /remaining: More remaining/],
  ])("refuses %s", (_n, input, pattern) => expect(message(stockLotInputSchema.safeParse(input))).toMatch(pattern));
});

describe("label stock and label query schemas", () => {
  it("refuses a label too small to be legible", () => {
    expect(message(labelStockSchema.safeParse({ id: "tiny", name: "Tiny", kind: "roll", width_mm: 30, height_mm: 15 }))).toMatch(
      /width_mm: Labels smaller than 40 × 20 mm/,
    );
  });
  it("refuses a sheet whose grid runs off the page", () => {
    const sheet = { pageWidth_mm: 210, pageHeight_mm: 297, columns: 3, rows: 6, marginLeft_mm: 5, marginTop_mm: 5 };
    expect(
      message(labelStockSchema.safeParse({ id: "wide", name: "Too wide", kind: "sheet", width_mm: 95, height_mm: 45, sheet })),
    ).toMatch(/sheet.columns: The grid is 290.0 mm wide/);
  });
  it.each([
    ["0", /copies must be at least 1/],
    ["2.5", /copies must be a whole number/],
    ["many", /copies must be a whole number/],
    ["501", /copies must be at most 500/],
  ])("copies=%s is refused", (copies, pattern) => {
    expect(message(labelQuery.safeParse({ copies }))).toMatch(pattern);
  });
});

describe("upload type detection by content (magic bytes)", () => {
  const bytes = (...b: number[]) => Uint8Array.from([...b, ...new Array(16).fill(0)]);
  it.each([
    ["a PDF", Uint8Array.from(Buffer.from("%PDF-1.7\n%âãÏÓ\n")), "application/pdf"],
    ["a PNG", bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a), "image/png"],
    ["a JPEG", bytes(0xff, 0xd8, 0xff, 0xe0), "image/jpeg"],
    ["a WebP", Uint8Array.from(Buffer.from("RIFF\x10\x00\x00\x00WEBPVP8 ", "latin1")), "image/webp"],
    ["a text file named .pdf", Uint8Array.from(Buffer.from("Certificate of analysis\nLot 123\n")), null],
    ["an HTML page", Uint8Array.from(Buffer.from("<!doctype html><script>alert(1)</script>")), null],
  ])("%s → %s", (_n, input, mime) => {
    expect(detectType(input)?.mime ?? null).toBe(mime);
  });
});

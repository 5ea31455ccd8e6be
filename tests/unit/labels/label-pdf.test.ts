import { join } from "node:path";
import { PDFDocument } from "pdf-lib";
import { describe, expect, it } from "vitest";
import { code128 } from "../../../src/lib/labels/barcode";
import { hazardSummary } from "../../../src/lib/labels/hazards";
import type { LabelContent } from "../../../src/lib/labels/layout";
import { measureLabel, renderLabels } from "../../../src/lib/labels/label-pdf";
import { DEFAULT_LABEL_STOCKS, labelsPerPage } from "../../../src/lib/labels/stocks";
import { decodeCode128 } from "./code128-reference";
import { scanLabels } from "./scan-labels";
import { pdfText } from "../../support/pdf-text";

// A demanding label: long name and composition, four pictograms, a deviation.
const hazards = hazardSummary([
  { reagent: "methanol", share_percent: 40 },
  { reagent: "phosphoric-acid", share_percent: 1.2 },
  { reagent: "water", share_percent: 58.8 },
]);
const CONTENT: LabelContent = {
  code: "B26-1203-12",
  name: "25 mM potassium phosphate pH 2.5 / methanol 60:40",
  composition:
    "Water 60 % + methanol 40 % · 25 mM potassium dihydrogen phosphate with phosphoric acid 85 %, pH 2.50 at 25 °C (aqueous part) · measured pH 2.53",
  prepared: "2026-12-03 08:30 CET",
  expires: "2026-12-10 08:30 CET",
  preparer: "Rowan Ellery",
  bottles: 3,
  storage: "2–8 °C, capped, in the flammables refrigerator",
  pictograms: hazards.pictograms,
  signalWord: hazards.signalWord,
  hazardStatements: hazards.statements,
  deviation: "pH 2.58 is +0.08 from the target 2.50. Reason: meter recalibrated, within method robustness",
  channel: "A",
};

const pdftotext = (bytes: Uint8Array) => pdfText(bytes);

describe("hazard summary", () => {
  it("takes the pictograms of components at 1 % or more and drops the exclamation mark beside the skull", () => {
    expect(hazards.pictograms).toEqual(["GHS02", "GHS05", "GHS06", "GHS08"]);
    expect(hazards.signalWord).toBe("Danger");
    expect(hazards.statements).toContain("H225 Highly flammable liquid and vapour");
  });
  it("ignores 0.1 % formic acid in water (below the cut-off)", () => {
    expect(
      hazardSummary([
        { reagent: "water", share_percent: 99.9 },
        { reagent: "formic-acid", share_percent: 0.1 },
      ]),
    ).toMatchObject({ pictograms: [], signalWord: null });
  });
});

describe("Code 128 barcode", () => {
  it.each(["B26-1203", "B26-1203-2", "B26-0101-999", "Decant 42"])("%s decodes back from the bars Decant draws", async (code) => {
    const layout = await measureLabel({ ...CONTENT, code }, DEFAULT_LABEL_STOCKS[0]!);
    // Rebuild the module string from the drawn rectangles: bar positions and widths in modules.
    const m = layout.barcode.moduleWidth;
    const last = layout.barcode.bars[layout.barcode.bars.length - 1]!;
    const length = Math.round((last.x + last.width - layout.barcode.x) / m);
    const modules = Array.from({ length }, () => "0");
    for (const bar of layout.barcode.bars) {
      const start = Math.round((bar.x - layout.barcode.x) / m);
      for (let i = 0; i < Math.round(bar.width / m); i++) modules[start + i] = "1";
    }
    const decoded = decodeCode128(modules.join(""));
    expect(decoded.text).toBe(code);
    expect(decoded.checksumOk).toBe(true);
  });
  it("refuses what Code 128 set B cannot carry", () => {
    expect(() => code128("B26–1203")).toThrow(/printable ASCII/);
  });
});

describe.each(DEFAULT_LABEL_STOCKS.map((s) => [s.id, s] as const))("label stock %s", (_id, stock) => {
  it("fits the required text inside the label, measured with the embedded font", async () => {
    const layout = await measureLabel(CONTENT, stock, 3);
    expect(layout.overflow).toBe(false);
    for (const t of layout.texts) {
      expect(t.x).toBeGreaterThanOrEqual(0);
      expect(t.x + t.width).toBeLessThanOrEqual(layout.width - layout.padding + 0.01);
      expect(t.y).toBeGreaterThanOrEqual(layout.padding * 0.5);
      expect(t.y + t.size).toBeLessThanOrEqual(layout.height);
    }
    const blocks = new Set(layout.texts.map((t) => t.block));
    for (const required of ["code", "name", "composition", "dates", "preparer", "storage", "deviation", "signal"])
      expect(blocks).toContain(required);
    // Only the optional blocks may be left off, and only on small stocks.
    for (const omitted of layout.omitted) expect(["hazards", "sop"]).toContain(omitted);
    // Stocks of 90 mm and wider never shorten anything; the smallest may cut descriptive text to one line.
    if (stock.width_mm >= 90) expect(layout.truncated).toEqual([]);
    for (const cut of layout.truncated) expect(["composition", "storage", "deviation", "name"]).toContain(cut);
    // Barcode bars stay clear of the pictogram column.
    const lastBar = layout.barcode.bars[layout.barcode.bars.length - 1]!;
    for (const p of layout.pictograms) expect(lastBar.x + lastBar.width).toBeLessThan(p.cx - p.half);
  });

  it("keeps everything, hazard statements included, for a typical organic channel on stocks of 90 mm and wider", async () => {
    const acn = hazardSummary([
      { reagent: "acetonitrile", share_percent: 99.9 },
      { reagent: "formic-acid", share_percent: 0.1 },
    ]);
    const typical = {
      ...CONTENT,
      name: "0.1 % formic acid in acetonitrile",
      composition: "Acetonitrile 100 % · formic acid 0.1 %v/v",
      deviation: null,
      storage: "Flammables cabinet",
      pictograms: acn.pictograms,
      signalWord: acn.signalWord,
      hazardStatements: acn.statements,
    };
    const layout = await measureLabel(typical, stock, 1);
    expect(layout.overflow).toBe(false);
    if (stock.width_mm >= 90) expect(layout.omitted).toEqual([]);
    expect(layout.truncated).toEqual([]);
  });

  it.each([1, 3, 13])("copies=%i gives that many labels, on the right number of pages", async (copies) => {
    const rendered = await renderLabels({ content: CONTENT, stock, copies });
    expect(rendered.labels).toHaveLength(copies);
    expect(rendered.pages).toBe(Math.ceil(copies / labelsPerPage(stock)));
    const doc = await PDFDocument.load(rendered.bytes);
    expect(doc.getPageCount()).toBe(rendered.pages);
    // Bottles run 1…3 and round again.
    expect(rendered.labels.map((l) => l.bottle).slice(0, 4)).toEqual([1, 2, 3, 1].slice(0, Math.min(4, copies)));
  });

  it("prints a barcode on every copy that scans back as the batch code", async () => {
    // A full page and one more label: the second page's other slots stay blank.
    const copies = labelsPerPage(stock) + 1;
    const rendered = await renderLabels({ content: CONTENT, stock, copies });
    const scanned = scanLabels(rendered.bytes, stock);
    expect(scanned.slice(0, copies)).toEqual(Array.from({ length: copies }, () => CONTENT.code));
    expect(scanned.slice(copies).every((s) => s === null)).toBe(true);
  });
});

describe("label PDF text", () => {
  it("holds the code, the ISO 8601 dates, the preparer and the bottle numbers (read back with pdftotext)", async () => {
    const rendered = await renderLabels({ content: CONTENT, stock: DEFAULT_LABEL_STOCKS[0]!, copies: 3 });
    const text = pdftotext(rendered.bytes);
    expect(text).toContain("B26-1203-12");
    expect(text).toContain("2026-12-03 08:30");
    expect(text).toContain("2026-12-10 08:30");
    expect(text).toContain("Rowan Ellery");
    for (const n of [1, 2, 3]) expect(text).toContain(`Bottle ${n} of 3`);
    expect(text).toContain("DANGER");
    expect(text.match(/B26-1203-12/g)).toHaveLength(3);
  });
  it("gives every copy on a sheet its own bottle line", async () => {
    const rendered = await renderLabels({ content: CONTENT, stock: DEFAULT_LABEL_STOCKS.find((s) => s.kind === "sheet")!, copies: 13 });
    const text = pdftotext(rendered.bytes);
    expect(text.match(/B26-1203-12/g)).toHaveLength(13);
    // Bottles run 1…3 and round again: 1 five times, 2 and 3 four times.
    expect([1, 2, 3].map((n) => text.split(`Bottle ${n} of 3`).length - 1)).toEqual([5, 4, 4]);
  });
  it("prints one bottle's label when asked", async () => {
    const rendered = await renderLabels({ content: CONTENT, stock: DEFAULT_LABEL_STOCKS[0]!, copies: 2, bottle: 2 });
    expect(rendered.labels.map((l) => l.bottle)).toEqual([2, 2]);
  });
});

// Every label stock's barcode read by a decoder Decant did not write: the PDF is rasterised by
// poppler's pdftoppm at a thermal printer's 203 dpi and at 300 dpi, grey (anti-aliased) and
// black-and-white (what a thermal head prints), and read by Debian's zbarimg (ZBar). The 2 × 1 in
// bottle label is the hard case: its bars are narrowest there.
import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { hazardSummary } from "../../../src/lib/labels/hazards";
import { renderLabels } from "../../../src/lib/labels/label-pdf";
import type { LabelContent } from "../../../src/lib/labels/layout";
import { DEFAULT_LABEL_STOCKS } from "../../../src/lib/labels/stocks";

const hazards = hazardSummary([
  { reagent: "methanol", share_percent: 40 },
  { reagent: "water", share_percent: 60 },
]);
// The longest code shape Decant prints (a batch with a same-day suffix), on a busy label.
const CONTENT: LabelContent = {
  code: "B26-1203-12",
  name: "Methanol / water 40:60",
  composition: "Water 60 % + methanol 40 %",
  prepared: "2026-12-03 08:30 CET",
  expires: "2026-12-10 08:30 CET",
  preparer: "Rowan Ellery",
  bottles: 2,
  storage: "Capped, in the flammables cabinet",
  pictograms: hazards.pictograms,
  signalWord: hazards.signalWord,
  hazardStatements: hazards.statements,
  deviation: null,
  channel: "A",
};

const dir = mkdtempSync(join(tmpdir(), "decant-zbar-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** What zbarimg reads on the first page, rendered by pdftoppm; [] when it finds no Code 128. */
function zbarRead(pdf: Uint8Array, name: string, dpi: number, mono: boolean): string[] {
  const file = join(dir, `${name}.pdf`);
  writeFileSync(file, pdf);
  const image = join(dir, `${name}-${dpi}-${mono ? "mono" : "grey"}`);
  execFileSync("pdftoppm", ["-r", String(dpi), mono ? "-mono" : "-gray", "-png", "-singlefile", "-f", "1", "-l", "1", file, image]);
  try {
    const out = execFileSync("zbarimg", ["--quiet", "--raw", "-Sdisable", "-Scode128.enable", `${image}.png`], { encoding: "utf8" });
    return out.split("\n").filter(Boolean);
  } catch {
    return []; // zbarimg exits 4 when it finds nothing
  }
}

describe("labels scanned by ZBar at 203 and 300 dpi", () => {
  const cases = DEFAULT_LABEL_STOCKS.flatMap((stock) =>
    [203, 300].flatMap((dpi) => [false, true].map((mono) => ({ stock, dpi, mono, mode: mono ? "black and white" : "grey" }))),
  );
  it.each(cases)("$stock.id at $dpi dpi, $mode: the barcode reads as the batch code", async ({ stock, dpi, mono }) => {
    const rendered = await renderLabels({ content: CONTENT, stock, copies: 1 });
    expect(zbarRead(rendered.bytes, stock.id, dpi, mono)).toEqual([CONTENT.code]);
  });

  it("finds nothing on a page without a barcode (the decoder can fail)", () => {
    const blank = join(dir, "blank.png");
    execFileSync("ffmpeg", ["-v", "error", "-y", "-f", "lavfi", "-i", "color=white:s=600x300", "-frames:v", "1", blank]);
    expect(() => execFileSync("zbarimg", ["--quiet", "--raw", blank], { encoding: "utf8" })).toThrow();
  });
});

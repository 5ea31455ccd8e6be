// Reads the barcodes back from printed label pages, as a scanner would: the PDF is rasterised by
// poppler's pdftoppm (grey, 300 dpi, about what label printers print), and in each label slot a
// line through the bars is thresholded, its runs rounded to modules and decoded with the
// reference decoder. Nothing here comes from the layout, so it checks what is actually drawn.
import { execFileSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { LabelStock } from "../../../src/lib/schemas/labels";
import { MM_TO_PT, labelsPerPage, pageGeometry } from "../../../src/lib/labels/stocks";
import { decodeCode128 } from "./code128-reference";

/** Bars and spaces along one pixel row, as signed run lengths (bars positive). */
function runsOf(row: Uint8Array): number[] {
  const runs: number[] = [];
  for (let x = 0; x < row.length; ) {
    const dark = row[x]! < 128;
    let end = x;
    while (end < row.length && row[end]! < 128 === dark) end++;
    runs.push(dark ? end - x : x - end);
    x = end;
  }
  return runs;
}

/** The Code 128 symbol along a row, or null when the row does not cross one that decodes. */
function decodeRow(row: Uint8Array): string | null {
  const runs = runsOf(row);
  const first = runs.findIndex((r) => r > 0);
  if (first < 0) return null;
  // Every start symbol opens with a 2-module bar; the symbol ends at the first space wider than
  // the widest a symbol has (4 modules), i.e. at the quiet zone.
  const module0 = runs[first]! / 2;
  let last = first;
  while (last + 2 < runs.length && -runs[last + 1]! <= 6 * module0) last += 2;
  const widths = runs.slice(first, last + 1).map(Math.abs);
  // Start, data and check symbols are 6 runs of 11 modules; the stop is 7 runs of 13.
  const symbols = (widths.length - 7) / 6;
  if (!Number.isInteger(symbols) || symbols < 2) return null;
  const module = widths.reduce((a, b) => a + b, 0) / (11 * symbols + 13);
  const pattern = widths.map((w, i) => (i % 2 ? "0" : "1").repeat(Math.max(1, Math.round(w / module)))).join("");
  try {
    const decoded = decodeCode128(pattern);
    return decoded.checksumOk ? decoded.text : null;
  } catch {
    return null;
  }
}

/** What a scanner reads on each label slot of each page, page by page; null for a slot with no barcode. */
export function scanLabels(pdf: Uint8Array, stock: LabelStock, dpi = 300): (string | null)[] {
  const dir = mkdtempSync(join(tmpdir(), "decant-scan-"));
  try {
    return scanPages(dir, pdf, stock, dpi);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

function scanPages(dir: string, pdf: Uint8Array, stock: LabelStock, dpi: number): (string | null)[] {
  writeFileSync(join(dir, "labels.pdf"), pdf);
  execFileSync("pdftoppm", ["-r", String(dpi), "-gray", join(dir, "labels.pdf"), join(dir, "page")]);
  const px = dpi / 72;
  const geometry = pageGeometry(stock);
  const found: (string | null)[] = [];
  for (const file of readdirSync(dir)
    .filter((f) => f.endsWith(".pgm"))
    .sort()) {
    // Binary PGM: "P5 width height 255" and one byte per pixel.
    const image = readFileSync(join(dir, file));
    const [, width = 0, height = 0] = image.subarray(0, 32).toString("latin1").split(/\s+/).map(Number);
    const pixels = image.subarray(image.length - width * height);
    for (const slot of geometry.slots.slice(0, labelsPerPage(stock))) {
      const left = Math.round(slot.x * px);
      const right = Math.round((slot.x + stock.width_mm * MM_TO_PT) * px);
      const top = height - Math.round((slot.y + stock.height_mm * MM_TO_PT) * px);
      // The bars run across the top of the label: try lines down its upper half until one reads.
      let text: string | null = null;
      for (let y = top; y < top + (stock.height_mm * MM_TO_PT * px) / 2 && text === null; y += 2) {
        text = decodeRow(pixels.subarray(y * width + left, y * width + right));
      }
      found.push(text);
    }
  }
  return found;
}

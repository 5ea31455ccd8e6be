/**
 * The printable label of a waste container: its code as Code 128 and in large type, the stream,
 * the GHS pictograms of what it may contain, the accumulation start date and where it stands.
 * Reuses the label module's embedded font, Code 128 encoder and pictogram drawings.
 */
import { PDFDocument, rgb, type PDFFont, type PDFPage } from "pdf-lib";
import type { GhsPictogram } from "../chem";
import { code128 } from "../labels/barcode";
import { DIAMOND, PICTOGRAM_SHAPES, SYMBOL_SCALE } from "../labels/ghs-pictograms";
import { embedLabelFonts, sanitizer } from "../labels/label-pdf";
import { MM_TO_PT } from "../labels/stocks";

export interface ContainerLabelContent {
  code: string;
  streamName: string;
  capacity_mL: number;
  room: string;
  where: string | null;
  /** YYYY-MM-DD, or null when accumulation has not started. */
  accumulationStartedOn: string | null;
  pictograms: readonly GhsPictogram[];
  signalWord: "Danger" | "Warning" | null;
  /** Main contents, e.g. "Acetonitrile", "Water". */
  contents: readonly string[];
  facility: string;
}

const INK = rgb(0.07, 0.09, 0.12);
const BLACK = rgb(0, 0, 0);
const WHITE = rgb(1, 1, 1);
const GHS_RED = rgb(0.88, 0, 0);
/** 100 × 100 mm: large enough to read at arm's length on a 10–20 L carboy. */
export const CONTAINER_LABEL_MM = { width: 100, height: 100 };

function fit(text: string, font: PDFFont, size: number, maxWidth: number): string {
  if (font.widthOfTextAtSize(text, size) <= maxWidth) return text;
  let t = text;
  while (t.length > 1 && font.widthOfTextAtSize(`${t}…`, size) > maxWidth) t = t.slice(0, -1);
  return `${t}…`;
}

function wrap(text: string, font: PDFFont, size: number, maxWidth: number): string[] {
  const lines: string[] = [];
  let line = "";
  for (const word of text.split(" ")) {
    const next = line ? `${line} ${word}` : word;
    if (line && font.widthOfTextAtSize(next, size) > maxWidth) {
      lines.push(line);
      line = word;
    } else line = next;
  }
  if (line) lines.push(line);
  return lines;
}

function drawPictogram(page: PDFPage, code: GhsPictogram, cx: number, cy: number, half: number) {
  const scale = half / 50;
  page.drawSvgPath(DIAMOND, { x: cx, y: cy, scale, color: WHITE, borderColor: GHS_RED, borderWidth: Math.max(0.8, half * 0.1) });
  for (const shape of PICTOGRAM_SHAPES[code])
    page.drawSvgPath(shape.d, { x: cx, y: cy, scale: scale * SYMBOL_SCALE, color: shape.fill === "black" ? BLACK : WHITE });
}

export async function renderContainerLabel(content: ContainerLabelContent, copies = 1): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  doc.setTitle(`Waste container label ${content.code}`);
  doc.setCreator("Decant");
  doc.setProducer("Decant (pdf-lib)");
  const fonts = await embedLabelFonts(doc);
  const clean = sanitizer(fonts.regular);
  const W = CONTAINER_LABEL_MM.width * MM_TO_PT;
  const H = CONTAINER_LABEL_MM.height * MM_TO_PT;
  const m = 5 * MM_TO_PT;
  const inner = W - 2 * m;
  for (let copy = 0; copy < copies; copy++) {
    const page = doc.addPage([W, H]);
    const text = (s: string, x: number, y: number, size: number, bold = false, maxWidth = inner) => {
      const font = bold ? fonts.bold : fonts.regular;
      page.drawText(fit(clean(s), font, size, maxWidth), { x, y, size, font, color: INK });
    };
    page.drawRectangle({ x: 1.5, y: 1.5, width: W - 3, height: H - 3, borderColor: INK, borderWidth: 1.2 });
    // Header band: what it is, in words anyone can read.
    let y = H - m - 11;
    text("CHEMICAL WASTE", m, y, 11, true);
    text(content.facility, m, y - 10, 7, false);
    y -= 30;
    text(content.streamName, m, y, 15, true);
    y -= 14;
    text(
      `Container ${content.code} · ${Math.round(content.capacity_mL / 100) / 10} L · ${content.room}${content.where ? ` · ${content.where}` : ""}`,
      m,
      y,
      8,
    );
    y -= 12;
    text(`Accumulation started: ${content.accumulationStartedOn ?? "not yet — write the date of the first addition"}`, m, y, 9, true);

    // Pictograms, in a row under the text.
    const half = 8.5 * MM_TO_PT;
    const picsY = y - 6 - half;
    content.pictograms.slice(0, 5).forEach((p, i) => drawPictogram(page, p, m + half + i * (2 * half + 3), picsY, half));
    if (content.signalWord)
      text(
        content.signalWord.toUpperCase(),
        m + Math.min(5, content.pictograms.length) * (2 * half + 3) + 2,
        picsY - 4,
        12,
        true,
        inner / 2,
      );
    y = picsY - half - 11;
    if (content.contents.length) text(`Contains: ${content.contents.join(", ")}`, m, y, 7.5, false);
    y -= 11;
    for (const line of wrap(
      "Keep closed except when adding waste. Do not mix incompatible wastes. Follow your institution's hazardous-waste procedures and local regulations.",
      fonts.regular,
      7,
      inner,
    )) {
      text(line, m, y, 7);
      y -= 9;
    }

    // Barcode along the bottom, with the code in words below it.
    const symbol = code128(content.code);
    const quiet = 10;
    const module = Math.min(1.1, (inner * 0.8) / (symbol.modules.length + 2 * quiet));
    const barWidth = symbol.modules.length * module;
    const bx = (W - barWidth) / 2;
    const bh = 11 * MM_TO_PT;
    const by = m + 11;
    for (const bar of symbol.bars)
      page.drawRectangle({ x: bx + bar.start * module, y: by, width: bar.width * module, height: bh, color: BLACK });
    const codeWidth = fonts.bold.widthOfTextAtSize(content.code, 10);
    page.drawText(content.code, { x: (W - codeWidth) / 2, y: m, size: 10, font: fonts.bold, color: INK });
  }
  return doc.save();
}

/**
 * Bottle labels as PDF: pdf-lib with the app's own font embedded (subset), the batch code as a
 * Code 128 barcode drawn as vector bars, GHS pictograms drawn as vectors.
 */
import {
  PDFDocument, PDFName, beginText, concatTransformationMatrix, drawObject, drawSvgPath, endText, fill, popGraphicsState, pushGraphicsState, rectangle, rgb,
  setFillingColor, setFontAndSize, setTextMatrix, showText,
  type PDFFont, type PDFPage, type PDFRef,
} from "pdf-lib";
import type { GhsPictogram } from "../chem";
import type { LabelStock } from "../schemas/labels";
import { labelFontkit, labelFonts } from "./fonts";
import { DIAMOND, PICTOGRAM_SHAPES, SYMBOL_SCALE } from "./ghs-pictograms";
import { layoutLabel, type LabelContent, type LabelLayout, type Measurer } from "./layout";
import { MM_TO_PT, pageGeometry, labelsPerPage } from "./stocks";

const INK = rgb(0.07, 0.09, 0.12);
const GHS_RED = rgb(0.88, 0, 0);
const WHITE = rgb(1, 1, 1);
const BLACK = rgb(0, 0, 0);

export interface LabelFonts {
  regular: PDFFont;
  bold: PDFFont;
}

// Per font (by name: every label PDF embeds the same two fonts), kept across documents, so a
// warm label costs drawing rather than fontkit's text layout.
const characterSets = new Map<string, Set<number>>();
const unitWidths = new Map<string, Map<string, number>>();
const MAX_CACHED_WIDTHS = 50_000;

/** Replaces characters the embedded subset lacks, so that nothing prints as an empty box. */
export function sanitizer(font: PDFFont) {
  let known = characterSets.get(font.name);
  if (!known) {
    known = new Set(font.getCharacterSet());
    characterSets.set(font.name, known);
  }
  const set = known;
  return (text: string) =>
    Array.from(text.normalize("NFC"))
      .map((ch) => (set.has(ch.codePointAt(0)!) ? ch : ch === "≥" ? ">=" : ch === "≤" ? "<=" : "?"))
      .join("");
}

export function measurerFor(fonts: LabelFonts): Measurer {
  const clean = sanitizer(fonts.regular);
  // Advance widths scale linearly with size, so each string is measured once (fontkit layout is slow).
  const cacheOf = (font: PDFFont) => {
    let cache = unitWidths.get(font.name);
    if (!cache) {
      cache = new Map();
      unitWidths.set(font.name, cache);
    }
    return cache;
  };
  const caches = { regular: cacheOf(fonts.regular), bold: cacheOf(fonts.bold) };
  return {
    width(text, size, bold) {
      const cache = bold ? caches.bold : caches.regular;
      let unit = cache.get(text);
      if (unit === undefined) {
        unit = (bold ? fonts.bold : fonts.regular).widthOfTextAtSize(clean(text), 1000) / 1000;
        if (cache.size >= MAX_CACHED_WIDTHS) cache.clear();
        cache.set(text, unit);
      }
      return unit * size;
    },
  };
}

export async function embedLabelFonts(doc: PDFDocument): Promise<LabelFonts> {
  doc.registerFontkit(labelFontkit);
  const bytes = labelFonts();
  return { regular: await doc.embedFont(bytes.regular, { subset: true }), bold: await doc.embedFont(bytes.bold, { subset: true }) };
}

type PlacePictogram = (page: PDFPage, code: GhsPictogram, cx: number, cy: number, half: number) => void;

/**
 * Draws each pictogram once per document, as a form XObject in the drawings' −50…50 box, and
 * places it on every label: parsing and writing the SVG paths for every label was a tenth of the
 * time and most of the file. The border width is part of the drawing, so it is a separate form
 * per width (one per batch in practice: the stock fixes the pictogram size).
 */
function pictogramPlacer(doc: PDFDocument): PlacePictogram {
  const forms = new Map<string, { name: PDFName; ref: PDFRef }>();
  const formOf = (code: GhsPictogram, borderWidth: number) => {
    const key = `${code}-${borderWidth}`;
    let form = forms.get(key);
    if (!form) {
      const operators = [
        ...drawSvgPath(DIAMOND, { x: 0, y: 0, scale: 1, color: WHITE, borderColor: GHS_RED, borderWidth }),
        ...PICTOGRAM_SHAPES[code].flatMap((shape) => drawSvgPath(shape.d, { x: 0, y: 0, scale: SYMBOL_SCALE, color: shape.fill === "black" ? BLACK : WHITE, borderColor: undefined, borderWidth: 0 })),
      ];
      const reach = 50 + borderWidth;
      const stream = doc.context.formXObject(operators, { BBox: [-reach, -reach, reach, reach] });
      form = { name: PDFName.of(`${code}-${forms.size + 1}`), ref: doc.context.register(stream) };
      forms.set(key, form);
    }
    return form;
  };
  return (page, code, cx, cy, half) => {
    const scale = half / 50;
    // Widths are in the drawing's box, so they scale with the pictogram.
    const form = formOf(code, Math.max(0.8, half * 0.1));
    page.node.setXObject(form.name, form.ref);
    page.pushOperators(pushGraphicsState(), concatTransformationMatrix(scale, 0, 0, scale, cx, cy), drawObject(form.name), popGraphicsState());
  };
}

/** Draws laid-out labels onto the document's pages. */
function labelDrawer(doc: PDFDocument, fonts: LabelFonts, outline: boolean) {
  const clean = sanitizer(fonts.regular);
  const placePictogram = pictogramPlacer(doc);
  // One font resource per font and page (page.drawText adds a resource entry on every call).
  const fontKeys = new WeakMap<PDFPage, { regular: PDFName; bold: PDFName }>();
  const keysOf = (page: PDFPage) => {
    let keys = fontKeys.get(page);
    if (!keys) {
      keys = { regular: page.node.newFontDictionary(fonts.regular.name, fonts.regular.ref), bold: page.node.newFontDictionary(fonts.bold.name, fonts.bold.ref) };
      fontKeys.set(page, keys);
    }
    return keys;
  };
  return (page: PDFPage, layout: LabelLayout, ox: number, oy: number) => {
    if (outline) page.drawRectangle({ x: ox + 0.25, y: oy + 0.25, width: layout.width - 0.5, height: layout.height - 0.5, borderColor: rgb(0.75, 0.75, 0.75), borderWidth: 0.5 });
    // One fill per bar (a single rectangle is what viewers snap to whole pixels), in one graphics state.
    const b = layout.barcode;
    page.pushOperators(pushGraphicsState(), setFillingColor(BLACK), ...b.bars.flatMap((bar) => [rectangle(ox + bar.x, oy + b.y, bar.width, b.height), fill()]), popGraphicsState());
    // All the text in one text object.
    const keys = keysOf(page);
    page.pushOperators(
      pushGraphicsState(), beginText(), setFillingColor(INK),
      ...layout.texts.flatMap((t) => [
        setFontAndSize(t.bold ? keys.bold : keys.regular, t.size),
        setTextMatrix(1, 0, 0, 1, ox + t.x, oy + t.y),
        showText((t.bold ? fonts.bold : fonts.regular).encodeText(clean(t.text))),
      ]),
      endText(), popGraphicsState(),
    );
    for (const p of layout.pictograms) placePictogram(page, p.code, ox + p.cx, oy + p.cy, p.half);
  };
}

export interface RenderLabelsInput {
  content: LabelContent;
  stock: LabelStock;
  copies: number;
  /** Print only this bottle, `copies` times; otherwise copies run 1…bottles and round again. */
  bottle?: number | undefined;
  /** Document title and metadata. */
  title?: string;
}

export interface RenderedLabels {
  bytes: Uint8Array;
  pages: number;
  labels: { bottle: number; page: number; layout: LabelLayout }[];
}

export async function renderLabels(input: RenderLabelsInput): Promise<RenderedLabels> {
  const { content, stock, copies } = input;
  const doc = await PDFDocument.create();
  doc.setTitle(input.title ?? `Labels ${content.code}`);
  doc.setSubject(`${copies} label(s) for batch ${content.code} on ${stock.name}`);
  doc.setCreator("Decant");
  doc.setProducer("Decant (pdf-lib)");
  const fonts = await embedLabelFonts(doc);
  const measure = measurerFor(fonts);
  const geometry = pageGeometry(stock);
  const perPage = labelsPerPage(stock);
  const size = { width: stock.width_mm * MM_TO_PT, height: stock.height_mm * MM_TO_PT };
  const draw = labelDrawer(doc, fonts, stock.kind === "sheet");
  // Labels of one batch differ only by the bottle number.
  const layouts = new Map<number, LabelLayout>();
  const labels: RenderedLabels["labels"] = [];
  let page: PDFPage | null = null;
  for (let i = 0; i < copies; i++) {
    const slot = i % perPage;
    if (slot === 0) page = doc.addPage([geometry.width, geometry.height]);
    const bottle = input.bottle ?? (i % Math.max(1, content.bottles)) + 1;
    let layout = layouts.get(bottle);
    if (!layout) {
      layout = layoutLabel(content, bottle, size, measure);
      layouts.set(bottle, layout);
    }
    const at = geometry.slots[slot]!;
    draw(page!, layout, at.x, at.y);
    labels.push({ bottle, page: doc.getPageCount(), layout });
  }
  const bytes = await doc.save();
  return { bytes, pages: doc.getPageCount(), labels };
}

/** Layout only, with the embedded font's metrics: what the tests and the print preview check. */
export async function measureLabel(content: LabelContent, stock: LabelStock, bottle = 1): Promise<LabelLayout> {
  const doc = await PDFDocument.create();
  const fonts = await embedLabelFonts(doc);
  return layoutLabel(content, bottle, { width: stock.width_mm * MM_TO_PT, height: stock.height_mm * MM_TO_PT }, measurerFor(fonts));
}

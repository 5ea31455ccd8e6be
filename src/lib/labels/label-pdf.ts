/**
 * Bottle labels as PDF: pdf-lib with the app's own font embedded (subset), the batch code as a
 * Code 128 barcode drawn as vector bars, GHS pictograms drawn as vectors. Each distinct label
 * (one per bottle number) and each pictogram is drawn once per document, as a form XObject, and
 * placed wherever it is printed.
 */
import {
  PDFDocument,
  PDFName,
  beginText,
  concatTransformationMatrix,
  drawObject,
  drawSvgPath,
  endText,
  fill,
  popGraphicsState,
  pushGraphicsState,
  rectangle,
  rgb,
  setFillingColor,
  setFontAndSize,
  setLineWidth,
  setStrokingColor,
  setTextMatrix,
  showText,
  stroke,
  type PDFFont,
  type PDFPage,
  type PDFRef,
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
/** The cut line around each label on a sheet. */
const OUTLINE = rgb(0.75, 0.75, 0.75);

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

interface Form {
  /** Its name in the resources of whatever places it. */
  name: string;
  ref: PDFRef;
}

/** Places a form XObject (drawn in its own box) at (x, y), scaled. */
function place(form: Form, x: number, y: number, scale = 1) {
  return [pushGraphicsState(), concatTransformationMatrix(scale, 0, 0, scale, x, y), drawObject(form.name), popGraphicsState()];
}

/**
 * Each pictogram is drawn once per document, as a form XObject in the drawings' −50…50 box.
 * The border width is part of the drawing, so there is a form per width (one per batch in
 * practice: the stock fixes the pictogram size).
 */
function pictogramForms(doc: PDFDocument) {
  const forms = new Map<string, Form>();
  return (code: GhsPictogram, borderWidth: number): Form => {
    const key = `${code}-${borderWidth}`;
    let form = forms.get(key);
    if (!form) {
      const operators = [
        ...drawSvgPath(DIAMOND, { x: 0, y: 0, scale: 1, color: WHITE, borderColor: GHS_RED, borderWidth }),
        ...PICTOGRAM_SHAPES[code].flatMap((shape) =>
          drawSvgPath(shape.d, {
            x: 0,
            y: 0,
            scale: SYMBOL_SCALE,
            color: shape.fill === "black" ? BLACK : WHITE,
            borderColor: undefined,
            borderWidth: 0,
          }),
        ),
      ];
      const reach = 50 + borderWidth;
      form = {
        name: `${code}-${forms.size + 1}`,
        ref: doc.context.register(doc.context.formXObject(operators, { BBox: [-reach, -reach, reach, reach] })),
      };
      forms.set(key, form);
    }
    return form;
  };
}

/**
 * Draws each distinct label once, as a form XObject in the label's own box, which every copy
 * places: the labels of a batch differ only by the bottle number, so drawing and compressing each
 * copy was most of the time and of the file.
 */
function labelForms(doc: PDFDocument, fonts: LabelFonts, outline: boolean) {
  const clean = sanitizer(fonts.regular);
  const pictogramForm = pictogramForms(doc);
  const fontNames = { regular: "Regular", bold: "Bold" };
  let count = 0;
  return (layout: LabelLayout): Form => {
    const b = layout.barcode;
    // Widths are in the pictogram's box, so they scale with it.
    const pictograms = layout.pictograms.map((p) => ({ p, form: pictogramForm(p.code, Math.max(0.8, p.half * 0.1)) }));
    const operators = [
      ...(outline
        ? [
            pushGraphicsState(),
            setStrokingColor(OUTLINE),
            setLineWidth(0.5),
            rectangle(0.25, 0.25, layout.width - 0.5, layout.height - 0.5),
            stroke(),
            popGraphicsState(),
          ]
        : []),
      // One fill per bar (a single rectangle is what viewers snap to whole pixels).
      pushGraphicsState(),
      setFillingColor(BLACK),
      ...b.bars.flatMap((bar) => [rectangle(bar.x, b.y, bar.width, b.height), fill()]),
      popGraphicsState(),
      pushGraphicsState(),
      beginText(),
      setFillingColor(INK),
      ...layout.texts.flatMap((t) => [
        setFontAndSize(t.bold ? fontNames.bold : fontNames.regular, t.size),
        setTextMatrix(1, 0, 0, 1, t.x, t.y),
        showText((t.bold ? fonts.bold : fonts.regular).encodeText(clean(t.text))),
      ]),
      endText(),
      popGraphicsState(),
      ...pictograms.flatMap(({ p, form }) => place(form, p.cx, p.cy, p.half / 50)),
    ];
    const resources = {
      Font: { [fontNames.regular]: fonts.regular.ref, [fontNames.bold]: fonts.bold.ref },
      XObject: Object.fromEntries(pictograms.map(({ form }) => [form.name, form.ref])),
    };
    // The box clips, and viewers round a clip to whole pixels: a point of margin keeps the outline's edge.
    const stream = doc.context.formXObject(operators, { BBox: [-1, -1, layout.width + 1, layout.height + 1], Resources: resources });
    return { name: `Label-${++count}`, ref: doc.context.register(stream) };
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
  const formOf = labelForms(doc, fonts, stock.kind === "sheet");
  const drawn = new Map<number, { layout: LabelLayout; form: Form }>();
  const labels: RenderedLabels["labels"] = [];
  let page: PDFPage | null = null;
  for (let i = 0; i < copies; i++) {
    const slot = i % perPage;
    if (slot === 0) page = doc.addPage([geometry.width, geometry.height]);
    const bottle = input.bottle ?? (i % Math.max(1, content.bottles)) + 1;
    let label = drawn.get(bottle);
    if (!label) {
      const layout = layoutLabel(content, bottle, size, measure);
      label = { layout, form: formOf(layout) };
      drawn.set(bottle, label);
    }
    const at = geometry.slots[slot]!;
    page!.node.setXObject(PDFName.of(label.form.name), label.form.ref);
    page!.pushOperators(...place(label.form, at.x, at.y));
    labels.push({ bottle, page: doc.getPageCount(), layout: label.layout });
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

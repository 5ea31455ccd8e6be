/**
 * Lays out one bottle label: pure arithmetic over a text measurer, so that tests can check with
 * the embedded font that nothing runs past the label's edge on any stock.
 *
 * Top left: the Code 128 barcode and the batch code under it. Right: the GHS pictograms in a
 * column. Below: text blocks in order of importance; the font shrinks step by step until all
 * fit, and only the optional blocks (hazard statements, the SOP line) may be left off, largest
 * stocks first keeping everything.
 */
import type { GhsPictogram } from "../chem";
import { code128 } from "./barcode";

/** What a label says, for one batch; the bottle number is added per copy. */
export interface LabelContent {
  code: string;
  /** Mobile-phase name, e.g. "25 mM potassium phosphate, pH 3.0". */
  name: string;
  /** In words: "Water 100 % + formic acid 0.1 % v/v". */
  composition: string;
  /** ISO 8601, e.g. "2026-12-01 08:30". */
  prepared: string;
  expires: string;
  preparer: string;
  bottles: number;
  storage: string | null;
  pictograms: GhsPictogram[];
  signalWord: "Danger" | "Warning" | null;
  hazardStatements: string[];
  /** A flagged deviation and its reason, shown in bold. */
  deviation: string | null;
  /** Channel the bottle feeds, e.g. "A". */
  channel: string | null;
}

export interface Measurer {
  width(text: string, size: number, bold: boolean): number;
}

export interface TextItem {
  kind: "text";
  text: string;
  x: number;
  /** Baseline, from the label's bottom edge. */
  y: number;
  size: number;
  bold: boolean;
  width: number;
  block: string;
}

export interface LabelLayout {
  width: number;
  height: number;
  padding: number;
  texts: TextItem[];
  barcode: { x: number; y: number; height: number; moduleWidth: number; modules: string; bars: { x: number; width: number }[] };
  pictograms: { code: GhsPictogram; cx: number; cy: number; half: number }[];
  /** Blocks left off for want of room. */
  omitted: string[];
  /** Blocks shortened to one line with an ellipsis (smallest stocks only). */
  truncated: string[];
  /** True when even the required text does not fit: the stock is too small. */
  overflow: boolean;
}

interface Block {
  id: string;
  text: string;
  bold: boolean;
  /** Size relative to the body size. */
  scale: number;
  required: boolean;
  /** Lines at most (further text is wrapped into them, then the block shrinks). */
  maxLines: number;
}

const LINE_GAP = 1.18;
const QUIET_ZONE_MODULES = 10;
/** One dot of a 203 dpi thermal printer, in points. */
const DOT_203 = 72 / 203;

export function bottleLine(n: number, of: number): string {
  return `Bottle ${n} of ${of}`;
}

function blocksFor(c: LabelContent, bottle: number, compact: boolean): Block[] {
  const dates = compact
    ? `Prep ${c.prepared.replace(/ [^ ]+$/, "")} · Exp ${c.expires}`
    : `Prepared ${c.prepared}  ·  Expires ${c.expires}`;
  const blocks: Block[] = [
    { id: "name", text: c.channel ? `${c.name} · ch. ${c.channel}` : c.name, bold: true, scale: 1.12, required: true, maxLines: 2 },
    { id: "composition", text: c.composition, bold: false, scale: 1, required: true, maxLines: 3 },
    { id: "dates", text: dates, bold: true, scale: 1, required: true, maxLines: 2 },
    { id: "preparer", text: `By ${c.preparer}  ·  ${bottleLine(bottle, c.bottles)}`, bold: false, scale: 1, required: true, maxLines: 2 },
  ];
  if (c.storage) blocks.push({ id: "storage", text: `Storage: ${c.storage}`, bold: false, scale: 1, required: true, maxLines: 2 });
  if (c.deviation) blocks.push({ id: "deviation", text: `DEVIATION: ${c.deviation}`, bold: true, scale: 1, required: true, maxLines: 3 });
  if (c.hazardStatements.length)
    blocks.push({ id: "hazards", text: c.hazardStatements.join("; "), bold: false, scale: 0.9, required: false, maxLines: 4 });
  blocks.push({
    id: "sop",
    text: "Hazards of components at 1 % or more. Follow your laboratory's SOPs and local regulations.",
    bold: false,
    scale: 0.85,
    required: false,
    maxLines: 2,
  });
  return blocks;
}

/** Greedy word wrap; a word longer than the line is broken by characters. `maxWidth` may vary by line. */
export function wrap(text: string, maxWidth: number | ((line: number) => number), size: number, bold: boolean, m: Measurer): string[] {
  const widthOf = typeof maxWidth === "number" ? () => maxWidth : maxWidth;
  const words = text.split(/\s+/).filter(Boolean);
  const lines: string[] = [];
  let line = "";
  const fits = (s: string) => m.width(s, size, bold) <= widthOf(lines.length);
  for (let word of words) {
    const candidate = line ? `${line} ${word}` : word;
    if (fits(candidate)) {
      line = candidate;
      continue;
    }
    if (line) lines.push(line);
    line = "";
    while (!fits(word)) {
      let cut = word.length - 1;
      while (cut > 1 && !fits(word.slice(0, cut))) cut--;
      lines.push(word.slice(0, cut));
      word = word.slice(cut);
    }
    line = word;
  }
  if (line) lines.push(line);
  return lines;
}

export function layoutLabel(content: LabelContent, bottle: number, size: { width: number; height: number }, m: Measurer): LabelLayout {
  const { width, height } = size;
  const small = Math.min(width, height);
  const padding = Math.max(4, small * 0.07);
  const innerW = width - 2 * padding;
  const innerH = height - 2 * padding;

  // Pictograms: a column on the right, each diamond sized to the label.
  const count = content.pictograms.length;
  const maxHalf = Math.min(innerH * 0.2, 26);
  const half = count ? Math.max(6, Math.min(maxHalf, innerH / count / 2 - 1)) : 0;
  const perColumn = count ? Math.max(1, Math.floor(innerH / (2 * half + 2))) : 0;
  const columns = count ? Math.ceil(count / perColumn) : 0;
  const pictoColumnW = columns * (2 * half + 2);
  const textW = innerW - (count ? pictoColumnW + padding * 0.6 : 0);
  // Barcode: as wide as the text column allows, module width at least 0.5 pt. Where that would
  // make a module narrower than two dots of a 203 dpi printer (the 2 × 1 in label), the bars take
  // the label's whole width, modules snapped to whole dots, and the pictograms move below them.
  const symbol = code128(content.code);
  const totalModules = symbol.modules.length + 2 * QUIET_ZONE_MODULES;
  const barHeight = Math.max(small < 100 ? 11 : 12, Math.min(innerH * 0.22, 40));
  const fullWidth = count > 0 && textW / totalModules < 2 * DOT_203;
  const moduleWidth = fullWidth ? Math.max(2, Math.floor(innerW / totalModules / DOT_203)) * DOT_203 : Math.min(1.5, textW / totalModules);
  const barX = fullWidth
    ? Math.round((padding + QUIET_ZONE_MODULES * moduleWidth) / DOT_203) * DOT_203
    : padding + QUIET_ZONE_MODULES * moduleWidth;
  const pictoTop = height - padding - (fullWidth ? barHeight + 2 : 0);
  const pictoHalf = fullWidth ? Math.max(6, Math.min(half, (pictoTop - padding) / perColumn / 2 - 1)) : half;
  const pictograms = content.pictograms.map((code, i) => {
    const col = Math.floor(i / perColumn);
    const row = i % perColumn;
    const cx = width - padding - pictoHalf - col * (2 * pictoHalf + 2);
    const cy = pictoTop - pictoHalf - row * (2 * pictoHalf + 2);
    return { code, cx, cy, half: pictoHalf };
  });
  const barY = height - padding - barHeight;
  const barcode = {
    x: barX,
    y: barY,
    height: barHeight,
    moduleWidth,
    modules: symbol.modules,
    bars: symbol.bars.map((b) => ({ x: barX + b.start * moduleWidth, width: b.width * moduleWidth })),
  };

  const codeSize = Math.max(6, Math.min(13, barHeight * 0.42));
  const texts: TextItem[] = [];
  let cursor = barY - codeSize * 1.05;
  texts.push({
    kind: "text",
    block: "code",
    text: content.code,
    x: padding,
    y: cursor,
    size: codeSize,
    bold: true,
    width: m.width(content.code, codeSize, true),
  });
  // The signal word shares the code's line, at the right of the text column.
  if (content.signalWord) {
    const word = content.signalWord.toUpperCase();
    const w = m.width(word, codeSize, true);
    texts.push({ kind: "text", block: "signal", text: word, x: padding + textW - w, y: cursor, size: codeSize, bold: true, width: w });
  }
  const bodyTop = cursor - codeSize * 0.35;
  const available = bodyTop - padding;

  const blocks = blocksFor(content, bottle, small < 100);
  const body0 = Math.max(5.5, Math.min(9.5, small * 0.085));
  // Legibility floor: about 5.5 pt on ordinary labels, 4.2 pt on the smallest bottle labels.
  const minBody = small < 100 ? 4.2 : 5.5;
  // Body sizes to try, largest first, ending exactly at the floor.
  const sizes: number[] = [];
  for (let b = body0; b > minBody + 1e-9; b -= 0.25) sizes.push(b);
  sizes.push(minBody);
  let omitted: string[] = [];
  let chosen: { block: Block; lines: string[]; size: number }[] | null = null;
  // Lines beside the pictogram column keep to the text column; lines below it use the full width.
  const pictoBottom = pictograms.reduce((low, p) => Math.min(low, p.cy - p.half), height) - 1.5;
  const widthAt = (lineBottom: number) => (lineBottom > pictoBottom ? textW : innerW);
  const attempt = (list: Block[], body: number) => {
    const out: { block: Block; lines: string[]; size: number }[] = [];
    let y = bodyTop;
    for (const b of list) {
      const s = body * b.scale;
      const top = y;
      const lines = wrap(b.text, (k) => widthAt(top - (k + 1) * s * LINE_GAP), s, b.bold, m);
      if (lines.length > b.maxLines) return null;
      out.push({ block: b, lines, size: s });
      y -= lines.length * s * LINE_GAP;
    }
    return bodyTop - y <= available ? out : null;
  };
  let list = blocks;
  for (;;) {
    for (const body of sizes) if (!chosen) chosen = attempt(list, body);
    if (chosen) break;
    const drop = [...list].reverse().find((b) => !b.required);
    if (!drop) break;
    omitted = [...omitted, drop.id];
    list = list.filter((b) => b !== drop);
  }
  // Last resort on the smallest stocks: shorten the longer descriptive blocks to one line with an
  // ellipsis (the batch code leads to the full record); identity, dates and hazards are never cut.
  const truncated: string[] = [];
  for (const id of ["composition", "storage", "deviation", "name"]) {
    if (chosen) break;
    const block = list.find((b) => b.id === id);
    if (!block) continue;
    const s0 = minBody * block.scale;
    const [firstLine = ""] = wrap(block.text, textW, s0, block.bold, m);
    let cut = firstLine;
    while (cut.length > 1 && m.width(`${cut}…`, s0, block.bold) > textW) cut = cut.slice(0, -1);
    const short = cut === block.text ? block.text : `${cut.trimEnd()}…`;
    list = list.map((b) => (b === block ? { ...b, text: short, maxLines: 1 } : b));
    truncated.push(id);
    for (const body of sizes) if (!chosen) chosen = attempt(list, body);
  }
  let overflow = false;
  if (!chosen) {
    // Render at the smallest size anyway and report it; a test keeps every shipped stock from this.
    overflow = true;
    chosen = list.map((b) => ({ block: b, lines: wrap(b.text, textW, minBody * b.scale, b.bold, m), size: minBody * b.scale }));
  }
  cursor = bodyTop;
  for (const { block, lines, size: s } of chosen) {
    for (const line of lines) {
      cursor -= s * LINE_GAP;
      texts.push({
        kind: "text",
        block: block.id,
        text: line,
        x: padding,
        y: cursor + s * 0.22,
        size: s,
        bold: block.bold,
        width: m.width(line, s, block.bold),
      });
    }
  }
  return { width, height, padding, texts, barcode, pictograms, omitted, truncated, overflow };
}

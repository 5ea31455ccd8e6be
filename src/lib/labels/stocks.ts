/** Label stocks Decant ships with; a manager adds more in the preparation settings. */
import type { LabelStock } from "../schemas/labels";

export const MM_TO_PT = 72 / 25.4;

export const DEFAULT_LABEL_STOCKS: readonly LabelStock[] = [
  { id: "roll-100x50", name: "Roll, 100 × 50 mm", kind: "roll", width_mm: 100, height_mm: 50 },
  { id: "bottle-2x1in", name: "Small bottle label, 2 × 1 in", kind: "roll", width_mm: 50.8, height_mm: 25.4 },
  {
    id: "a4-2x6",
    name: "A4 sheet, 2 × 6 labels of 95 × 45 mm",
    kind: "sheet",
    width_mm: 95,
    height_mm: 45,
    sheet: { pageWidth_mm: 210, pageHeight_mm: 297, columns: 2, rows: 6, marginLeft_mm: 7.5, marginTop_mm: 6, gapX_mm: 5, gapY_mm: 3 },
  },
  {
    id: "letter-2x5",
    name: "US Letter sheet, 2 × 5 labels of 4 × 2 in",
    kind: "sheet",
    width_mm: 101.6,
    height_mm: 50.8,
    sheet: {
      pageWidth_mm: 215.9,
      pageHeight_mm: 279.4,
      columns: 2,
      rows: 5,
      marginLeft_mm: 4.7625,
      marginTop_mm: 12.7,
      gapX_mm: 3.175,
      gapY_mm: 0,
    },
  },
];

export const DEFAULT_LABEL_STOCK_ID = "roll-100x50";

export function labelsPerPage(stock: LabelStock): number {
  return stock.kind === "sheet" && stock.sheet ? stock.sheet.columns * stock.sheet.rows : 1;
}

/** Page size and the lower-left corner (pt) of each label slot on a page. */
export function pageGeometry(stock: LabelStock): { width: number; height: number; slots: { x: number; y: number }[] } {
  const w = stock.width_mm * MM_TO_PT;
  const h = stock.height_mm * MM_TO_PT;
  if (stock.kind !== "sheet" || !stock.sheet) return { width: w, height: h, slots: [{ x: 0, y: 0 }] };
  const s = stock.sheet;
  const pageW = s.pageWidth_mm * MM_TO_PT;
  const pageH = s.pageHeight_mm * MM_TO_PT;
  const slots: { x: number; y: number }[] = [];
  for (let row = 0; row < s.rows; row++) {
    for (let col = 0; col < s.columns; col++) {
      const x = (s.marginLeft_mm + col * (stock.width_mm + s.gapX_mm)) * MM_TO_PT;
      const top = (s.marginTop_mm + row * (stock.height_mm + s.gapY_mm)) * MM_TO_PT;
      slots.push({ x, y: pageH - top - h });
    }
  }
  return { width: pageW, height: pageH, slots };
}

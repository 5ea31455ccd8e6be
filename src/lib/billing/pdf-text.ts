import { rgb, type Color, type PDFFont, type PDFPage } from "pdf-lib";

/** The ink of Decant's documents. */
export const INK = rgb(0.11, 0.15, 0.2);

/**
 * Text helpers of a document that grows page by page: each draws on the page given last to
 * `onPage`, through the document's character filter, in the regular font unless told otherwise.
 */
export function textDrawer(clean: (s: string) => string, regular: PDFFont) {
  let page: PDFPage | undefined;
  const current = (): PDFPage => {
    if (!page) throw new Error("textDrawer: no page yet");
    return page;
  };
  return {
    onPage(next: PDFPage) {
      page = next;
    },
    text(s: string, x: number, y: number, size: number, font: PDFFont = regular, color: Color = INK) {
      current().drawText(clean(s), { x, y, size, font, color });
    },
    /** Text that ends at `xRight`. */
    right(s: string, xRight: number, y: number, size: number, font: PDFFont = regular, color: Color = INK) {
      const t = clean(s);
      current().drawText(t, { x: xRight - font.widthOfTextAtSize(t, size), y, size, font, color });
    },
    /** The text cut with an ellipsis to fit `width`. */
    fit(s: string, width: number, size: number, font: PDFFont = regular): string {
      let t = clean(s);
      if (font.widthOfTextAtSize(t, size) <= width) return t;
      while (t.length > 1 && font.widthOfTextAtSize(`${t}…`, size) > width) t = t.slice(0, -1);
      return `${t}…`;
    },
  };
}

/**
 * The label font, shipped with the app: IBM Plex Sans (SIL Open Font License 1.1, see
 * fonts/OFL.txt), Latin subset, unpacked to TrueType from the @fontsource/ibm-plex-sans WOFF
 * files by fonts/woff-to-ttf.mjs. Inlined into the server bundle so no path is looked up.
 */
import fontkit from "@pdf-lib/fontkit";
import type { PDFDocument } from "pdf-lib";
import regularUrl from "./fonts/IBMPlexSans-Regular-latin.ttf?inline";
import boldUrl from "./fonts/IBMPlexSans-SemiBold-latin.ttf?inline";

function bytesOf(dataUrl: string): Uint8Array {
  const base64 = dataUrl.slice(dataUrl.indexOf(",") + 1);
  return Uint8Array.from(Buffer.from(base64, "base64"));
}

let cache: { regular: Uint8Array; bold: Uint8Array } | undefined;

export function labelFonts() {
  cache ??= { regular: bytesOf(regularUrl), bold: bytesOf(boldUrl) };
  return cache;
}

type Fontkit = Parameters<PDFDocument["registerFontkit"]>[0];
type Font = ReturnType<Fontkit["create"]>;

const parsed = new WeakMap<Uint8Array, Font>();
const MAX_SHAPED_STRINGS = 20_000;
// pdf-lib places glyphs by their advance widths and ignores fontkit's positions, so the
// positioning features (kerning, mark placement) were most of the work of shaping, thrown away.
const SUBSTITUTIONS_ONLY = { kern: false, mark: false, mkmk: false };

/**
 * fontkit for pdf-lib that parses each font once per process and shapes each distinct string
 * once. pdf-lib shapes every string it encodes or measures, and labels repeat the same lines:
 * shaping was most of the time spent drawing labels. Fonts are read-only once parsed; each
 * document still makes its own subset.
 */
export const labelFontkit: Fontkit = {
  create(bytes) {
    let font = parsed.get(bytes);
    if (!font) {
      font = fontkit.create(bytes);
      const layout = font.layout.bind(font);
      const runs = new Map<string, ReturnType<Font["layout"]>>();
      font.layout = (text, features) => {
        if (features !== undefined) return layout(text, features);
        let run = runs.get(text);
        if (!run) {
          if (runs.size >= MAX_SHAPED_STRINGS) runs.clear();
          run = layout(text, SUBSTITUTIONS_ONLY);
          runs.set(text, run);
        }
        return run;
      };
      parsed.set(bytes, font);
    }
    return font;
  },
};

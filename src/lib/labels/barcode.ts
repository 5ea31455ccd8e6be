/**
 * Code 128 bar patterns from jsbarcode's encoder, without a canvas or DOM: jsbarcode's object
 * renderer hands back the module string ("1" = bar, "0" = space), which the label drawer turns
 * into vector rectangles.
 */
import JsBarcode from "jsbarcode";

export interface Bar {
  /** Offset of the bar from the start of the symbol, in modules. */
  start: number;
  /** Width of the bar, in modules. */
  width: number;
}

export interface Code128 {
  text: string;
  /** One character per module: "1" bar, "0" space (start, data, check and stop symbols). */
  modules: string;
  bars: Bar[];
}

/** Printable ASCII only: what a batch code is made of, and what every scanner types back. */
const PRINTABLE = /^[\x20-\x7e]+$/;

export function code128(text: string): Code128 {
  if (!PRINTABLE.test(text)) throw new Error(`A Code 128 label holds printable ASCII only, not "${text}".`);
  const target: { encodings?: { data: string }[] } = {};
  JsBarcode(target, text, { format: "CODE128" });
  const modules = (target.encodings ?? []).map((e) => e.data).join("");
  if (!/^[01]+$/.test(modules)) throw new Error(`jsbarcode gave no Code 128 pattern for "${text}".`);
  const bars: Bar[] = [];
  for (let i = 0; i < modules.length; ) {
    if (modules[i] === "1") {
      let j = i;
      while (modules[j] === "1") j++;
      bars.push({ start: i, width: j - i });
      i = j;
    } else i++;
  }
  return { text, modules, bars };
}

/**
 * The label font, shipped with the app: IBM Plex Sans (SIL Open Font License 1.1, see
 * fonts/OFL.txt), Latin subset, unpacked to TrueType from the @fontsource/ibm-plex-sans WOFF
 * files by fonts/woff-to-ttf.mjs. Inlined into the server bundle so no path lookup is needed.
 */
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

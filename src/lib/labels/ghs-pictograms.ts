/**
 * GHS pictograms drawn by Decant as vectors, following the UN GHS design (Annex 1 of the
 * "Purple Book"): a square set on a point with a red border and a black symbol on white.
 * The symbols are Decant's own simplified drawings of the standard's subjects. Each shape is
 * an SVG path in a box of −50…50 (y down), usable both in pdf-lib and in an <svg> on screen.
 */
import type { GhsPictogram } from "../chem";

export interface Shape {
  d: string;
  fill: "black" | "white";
}

const f = (n: number) => Number(n.toFixed(2));

/** A circle as four cubic Béziers (every path renderer understands these). */
export function circle(cx: number, cy: number, r: number): string {
  const k = 0.5523 * r;
  return [
    `M ${f(cx - r)} ${f(cy)}`,
    `C ${f(cx - r)} ${f(cy - k)} ${f(cx - k)} ${f(cy - r)} ${f(cx)} ${f(cy - r)}`,
    `C ${f(cx + k)} ${f(cy - r)} ${f(cx + r)} ${f(cy - k)} ${f(cx + r)} ${f(cy)}`,
    `C ${f(cx + r)} ${f(cy + k)} ${f(cx + k)} ${f(cy + r)} ${f(cx)} ${f(cy + r)}`,
    `C ${f(cx - k)} ${f(cy + r)} ${f(cx - r)} ${f(cy + k)} ${f(cx - r)} ${f(cy)} Z`,
  ].join(" ");
}

/** A straight bar of thickness t from (x1, y1) to (x2, y2). */
export function bar(x1: number, y1: number, x2: number, y2: number, t: number): string {
  const len = Math.hypot(x2 - x1, y2 - y1);
  const nx = (-(y2 - y1) / len) * (t / 2);
  const ny = ((x2 - x1) / len) * (t / 2);
  return `M ${f(x1 + nx)} ${f(y1 + ny)} L ${f(x2 + nx)} ${f(y2 + ny)} L ${f(x2 - nx)} ${f(y2 - ny)} L ${f(x1 - nx)} ${f(y1 - ny)} Z`;
}

function star(cx: number, cy: number, outer: number, inner: number, points: number): string {
  const parts: string[] = [];
  for (let i = 0; i < points * 2; i++) {
    const r = i % 2 === 0 ? outer : inner;
    const a = (Math.PI * i) / points - Math.PI / 2;
    parts.push(`${i === 0 ? "M" : "L"} ${f(cx + r * Math.cos(a))} ${f(cy + r * Math.sin(a))}`);
  }
  return `${parts.join(" ")} Z`;
}

const FLAME =
  "M 2 -46 C 10 -30 30 -18 28 4 C 27 22 16 32 0 32 C -16 32 -27 22 -27 6 C -27 -8 -18 -16 -14 -28 C -10 -18 -8 -12 -2 -8 C 2 -20 6 -32 2 -46 Z";
const GROUND = "M -36 38 L 36 38 L 36 45 L -36 45 Z";

const black = (d: string): Shape => ({ d, fill: "black" });
const white = (d: string): Shape => ({ d, fill: "white" });

export const PICTOGRAM_SHAPES: Readonly<Record<GhsPictogram, readonly Shape[]>> = {
  // Exploding bomb
  GHS01: [
    black(circle(0, 20, 15)),
    ...[-70, -40, -10, 20, 50, 80].map((deg) => {
      const a = ((deg - 90) * Math.PI) / 180;
      return black(bar(Math.cos(a) * 20, 20 + Math.sin(a) * 20, Math.cos(a) * 44, 20 + Math.sin(a) * 44, 5));
    }),
  ],
  // Flame
  GHS02: [black(FLAME), white("M 1 4 C 8 12 10 20 4 27 C -4 29 -10 24 -9 16 C -8 10 -4 8 1 4 Z"), black(GROUND)],
  // Flame over circle
  GHS03: [
    black(
      "M 1 -46 C 6 -36 18 -30 17 -16 C 16 -6 9 -2 0 -2 C -10 -2 -16 -8 -16 -16 C -16 -26 -10 -30 -8 -38 C -5 -32 -3 -28 0 -26 C 2 -34 3 -40 1 -46 Z",
    ),
    black(circle(0, 18, 18)),
    white(circle(0, 18, 10)),
    black(GROUND),
  ],
  // Gas cylinder
  GHS04: [
    black(
      "M -34 -4 C -34 -16 -26 -18 -20 -18 L 22 -18 C 28 -18 30 -12 30 -4 L 30 12 C 30 20 28 24 22 24 L -20 24 C -26 24 -34 22 -34 10 Z",
    ),
    black("M 30 -4 L 40 -4 L 40 10 L 30 10 Z"),
    black(GROUND),
  ],
  // Corrosion: two tubes pouring onto a surface and onto a hand
  GHS05: [
    black(bar(-38, -44, -18, -16, 9)),
    black(bar(30, -44, 10, -16, 9)),
    black(circle(-16, -4, 3.5)),
    black(circle(-16, 8, 3)),
    black(circle(8, -4, 3.5)),
    black(circle(8, 8, 3)),
    black("M -44 18 L -8 18 L -8 30 L -14 30 L -18 24 L -22 30 L -44 30 Z"),
    black("M 0 18 L 36 18 C 44 18 44 30 36 30 L 12 30 L 8 26 L 4 30 L 0 30 Z"),
    black("M -44 36 L 44 36 L 44 44 L -44 44 Z"),
  ],
  // Skull and crossbones
  GHS06: [
    black(bar(-32, 14, 32, 42, 8)),
    black(bar(32, 14, -32, 42, 8)),
    ...[
      [-32, 14],
      [32, 42],
      [32, 14],
      [-32, 42],
    ].map(([x, y]) => black(circle(x!, y!, 5.5))),
    black(circle(0, -16, 21)),
    black("M -12 -2 L 12 -2 L 12 10 L -12 10 Z"),
    white(circle(-8, -16, 5.5)),
    white(circle(8, -16, 5.5)),
    white("M 0 -8 L 3 -2 L -3 -2 Z"),
  ],
  // Exclamation mark
  GHS07: [black("M -8 -44 L 8 -44 L 5 18 L -5 18 Z"), black(circle(0, 34, 9))],
  // Health hazard
  GHS08: [
    black(circle(0, -34, 11)),
    black("M -30 46 L -30 2 C -30 -14 -18 -20 0 -20 C 18 -20 30 -14 30 2 L 30 46 Z"),
    white(star(0, 14, 20, 7, 8)),
  ],
  // Environment: a bare tree and a fish
  GHS09: [
    black(bar(-26, 40, -26, -40, 5)),
    black(bar(-26, -10, -44, -30, 4)),
    black(bar(-26, -20, -8, -40, 4)),
    black(bar(-26, 8, -10, -8, 4)),
    black("M -4 26 C 6 14 26 14 34 26 C 26 36 6 36 -4 26 Z"),
    black("M 32 26 L 46 16 L 46 36 Z"),
    white(circle(4, 24, 2.5)),
    black("M -46 42 L 46 42 L 46 46 L -46 46 Z"),
  ],
};

/** The red-bordered diamond, in the same −50…50 box. */
export const DIAMOND = "M 0 -47 L 47 0 L 0 47 L -47 0 Z";

/** Fraction of the diamond's half-diagonal that the symbol box spans. */
export const SYMBOL_SCALE = 0.64;

/** An <svg> for on-screen display (same drawing as on the label). */
export function pictogramSvg(code: GhsPictogram, sizePx: number): string {
  const s = SYMBOL_SCALE;
  const shapes = PICTOGRAM_SHAPES[code]
    .map((sh) => `<path d="${sh.d}" fill="${sh.fill === "black" ? "#000" : "#fff"}" transform="scale(${s})"/>`)
    .join("");
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="-50 -50 100 100" width="${sizePx}" height="${sizePx}" role="img" aria-label="${code}"><title>${code}</title><path d="${DIAMOND}" fill="#fff" stroke="#e00000" stroke-width="6" stroke-linejoin="miter"/>${shapes}</svg>`;
}

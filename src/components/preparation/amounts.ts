export type VolumeUnit = "ml" | "l";
export type MassUnit = "g" | "mg";

/** An amount with as many decimals as its size warrants (4 below 1, none from 1000). */
export function fmt(n: number, digits = 4): string {
  if (!Number.isFinite(n)) return "–";
  const abs = Math.abs(n);
  const d = abs >= 1000 ? 0 : abs >= 100 ? 1 : abs >= 10 ? 2 : abs >= 1 ? 3 : digits;
  return n.toFixed(d);
}

export type VolumeUnit = "ml" | "l";
export type MassUnit = "g" | "mg";

/** An amount with as many decimals as its size warrants (4 below 1, none from 1000). */
export function fmt(n: number, digits = 4): string {
  if (!Number.isFinite(n)) return "–";
  const abs = Math.abs(n);
  const d = abs >= 1000 ? 0 : abs >= 100 ? 1 : abs >= 10 ? 2 : abs >= 1 ? 3 : digits;
  return n.toFixed(d);
}

/** Common bottle sizes (mL); a share larger than all of them keeps its own size. */
const BOTTLE_SIZES = [100, 250, 500, 1000, 2000, 2500, 4000, 5000, 10_000, 20_000];
export const bottleSizeFor = (share_mL: number) => BOTTLE_SIZES.find((s) => s >= share_mL - 1e-9) ?? Math.ceil(share_mL);

/**
 * Retention in reversed-phase LC by the linear-solvent-strength model
 * (Snyder, Dolan & Gant 1979): log k = log kw − S·φ, with φ the volume
 * fraction of organic (%B/100), and its linear-gradient form (Snyder & Dolan
 * 2007): b = t0·Δφ·S/tG, k* = 1/(1.15·b),
 * tR = (t0/b)·log10[2.3·k0·b·(1 − tD/(t0·k0)) + 1] + t0 + tD,
 * with ln 10 used for "2.3". The dwell (delay) volume runs isocratically at
 * the initial composition; a solute still on the column when the gradient
 * ends finishes its run isocratically at the final composition.
 */
import { ChemInputError, requireFinite, isList } from "./warnings";

export interface FitLSSInput {
  runs: readonly { percentB: number; retention_min: number }[];
  deadTime_min: number;
}

export interface LSSParameters {
  logKw: number;
  S: number;
}

/** Least-squares fit of log k against φ. */
export function fitLSS(input: FitLSSInput): LSSParameters & { r2: number } {
  requireFinite(input.deadTime_min, "deadTime_min", { positive: true });
  const t0 = input.deadTime_min;
  if (!isList(input.runs) || input.runs.length < 2)
    throw new ChemInputError("invalid-input", "fitLSS needs at least two isocratic runs.", "runs");
  const xs: number[] = [];
  const ys: number[] = [];
  input.runs.forEach((r, i) => {
    requireFinite(r.percentB, `runs[${i}].percentB`, { min: 0, max: 100 });
    requireFinite(r.retention_min, `runs[${i}].retention_min`);
    if (!(r.retention_min > t0))
      throw new ChemInputError("invalid-input", `runs[${i}].retention_min must be later than the dead time.`, `runs[${i}].retention_min`);
    xs.push(r.percentB / 100);
    ys.push(Math.log10((r.retention_min - t0) / t0));
  });
  const n = xs.length;
  const mx = xs.reduce((a, b) => a + b, 0) / n;
  const my = ys.reduce((a, b) => a + b, 0) / n;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dx = (xs[i] ?? 0) - mx;
    const dy = (ys[i] ?? 0) - my;
    sxx += dx * dx;
    sxy += dx * dy;
    syy += dy * dy;
  }
  if (sxx === 0) throw new ChemInputError("invalid-input", "fitLSS needs runs at two or more different %B.", "runs");
  const slope = sxy / sxx;
  return { logKw: my - slope * mx, S: -slope, r2: syy === 0 ? 1 : (sxy * sxy) / (sxx * syy) };
}

export interface PredictRetentionInput extends LSSParameters {
  percentB: number;
  deadTime_min: number;
}

export function predictRetention(input: PredictRetentionInput): { k: number; retention_min: number } {
  requireFinite(input.deadTime_min, "deadTime_min", { positive: true });
  requireFinite(input.percentB, "percentB", { min: 0, max: 100 });
  requireFinite(input.logKw, "logKw");
  requireFinite(input.S, "S");
  const k = 10 ** (input.logKw - (input.S * input.percentB) / 100);
  return { k, retention_min: input.deadTime_min * (1 + k) };
}

export interface GradientRetentionInput extends LSSParameters {
  deadTime_min: number;
  dwell_min: number;
  gradient: { from_percentB: number; to_percentB: number; time_min: number };
}

export function gradientRetention(input: GradientRetentionInput): { retention_min: number; kStar: number; b: number } {
  const { logKw, S, deadTime_min: t0, dwell_min: tD, gradient } = input;
  requireFinite(t0, "deadTime_min", { positive: true });
  requireFinite(tD, "dwell_min", { min: 0 });
  requireFinite(logKw, "logKw");
  requireFinite(S, "S", { positive: true });
  requireFinite(gradient.from_percentB, "gradient.from_percentB", { min: 0, max: 100 });
  requireFinite(gradient.to_percentB, "gradient.to_percentB", { min: 0, max: 100 });
  requireFinite(gradient.time_min, "gradient.time_min", { positive: true });
  const phi0 = gradient.from_percentB / 100;
  const phi1 = gradient.to_percentB / 100;
  const tG = gradient.time_min;
  if (!(phi1 > phi0)) throw new ChemInputError("invalid-input", "The gradient must increase %B.", "gradient.to_percentB");
  const b = (t0 * (phi1 - phi0) * S) / tG;
  const kStar = 1 / (1.15 * b);
  const k0 = 10 ** (logKw - S * phi0);
  // Fraction of the column crossed during the dwell, isocratic at φ0.
  const fDwell = tD / (t0 * k0);
  if (fDwell >= 1) return { retention_min: t0 * (1 + k0), kStar, b };
  const tau = (t0 / b) * Math.log10(Math.LN10 * k0 * b * (1 - fDwell) + 1);
  if (tau <= tG) return { retention_min: tau + t0 + tD, kStar, b };
  // Still on the column at the end of the gradient: finish at the final composition.
  const fGradient = (10 ** ((b * tG) / t0) - 1) / (Math.LN10 * b * k0);
  const kEnd = 10 ** (logKw - S * phi1);
  return { retention_min: tD + tG + t0 * kEnd * (1 - fDwell - fGradient) + t0, kStar, b };
}

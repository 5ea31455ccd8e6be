/**
 * Shared by the benchmark modules: statistics over repetitions, and the one line each module
 * prints for `scripts/bench.mjs` to collect (`BENCH_ROWS [...]`, JSON).
 */

export interface Stats {
  median: number;
  min: number;
  max: number;
  p95: number;
  n: number;
}

export interface Target {
  op: "<" | "<=" | ">=";
  value: number;
}

/** One line of the table. `ratio` is this figure ÷ the baseline's, both measured in this run. */
export interface BenchRow {
  group: string;
  figure: string;
  unit: string;
  median: number;
  min: number;
  max: number;
  n: number;
  /** The statistic the target applies to when it is not the median (e.g. p95 over all requests). */
  targetOn?: string;
  targetValue?: number;
  target?: Target;
  baseline?: string;
  ratio?: number | null;
  ratioTarget?: Target;
  met?: boolean | null;
  note?: string;
}

const quantile = (sorted: number[], q: number) => {
  if (sorted.length === 0) return Number.NaN;
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1));
  return sorted[i]!;
};

export function stats(samples: readonly number[]): Stats {
  const s = [...samples].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  const median = s.length % 2 === 1 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
  return { median, min: s[0]!, max: s[s.length - 1]!, p95: quantile(s, 0.95), n: s.length };
}

export const check = (value: number, target: Target | undefined) =>
  target === undefined
    ? null
    : target.op === "<"
      ? value < target.value
      : target.op === "<="
        ? value <= target.value
        : value >= target.value;

/** A row whose target (if any) is judged on the median, or on `targetValue` when given. */
export function row(input: Omit<BenchRow, "median" | "min" | "max" | "n" | "met"> & { stats: Stats }): BenchRow {
  const { stats: s, ...rest } = input;
  const judged = rest.targetValue ?? s.median;
  const metValue = check(judged, rest.target);
  const metRatio = rest.ratio == null ? null : check(rest.ratio, rest.ratioTarget);
  const met = metValue === null && metRatio === null ? null : metValue !== false && metRatio !== false;
  return { ...rest, median: s.median, min: s.min, max: s.max, n: s.n, met };
}

/** Times an async function: `warmup` untimed calls, then `reps` timed ones (ms). */
export async function timeIt(fn: () => Promise<unknown>, reps: number, warmup = 1): Promise<number[]> {
  for (let i = 0; i < warmup; i++) await fn();
  const out: number[] = [];
  for (let i = 0; i < reps; i++) {
    const t0 = performance.now();
    await fn();
    out.push(performance.now() - t0);
  }
  return out;
}

/** The machine-readable line `scripts/bench.mjs` parses; everything else a module prints is for people. */
export function emit(rows: readonly BenchRow[]): void {
  console.log(`BENCH_ROWS ${JSON.stringify(rows)}`);
}

export const fmt = (x: number, digits = 0) => x.toLocaleString("en-GB", { maximumFractionDigits: digits, minimumFractionDigits: digits });

/** The environment `scripts/bench.mjs` hands to each module. */
export function benchEnv() {
  const baseURL = process.env.BENCH_BASE_URL;
  if (!baseURL) throw new Error("BENCH_BASE_URL is not set: run the benchmarks with `npm run bench`.");
  const cookies = JSON.parse(process.env.BENCH_COOKIES ?? "{}") as Record<string, string>;
  return { baseURL, cookies, appPid: Number(process.env.BENCH_APP_PID ?? 0) };
}

export function main(run: () => Promise<void>) {
  run().catch((error: unknown) => {
    console.error(error);
    process.exit(1);
  });
}

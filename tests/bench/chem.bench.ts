/**
 * Throughput of the chemistry library's two hot paths. A plain script, not a
 * test: `npm run bench -- chem` (or `npx tsx tests/bench/chem.bench.ts`).
 * Prints the median solves per second over several rounds, for one core, and
 * the same rate of a fixed reference kernel (plain floating-point arithmetic)
 * measured alongside, so a slow or busy machine shows in the ratio.
 *
 * Targets (issue 4): solutionPH on a two-component phosphate buffer
 * ≥ 50,000 /s; designBuffer ≥ 5,000 /s.
 */
import { designBuffer, solutionPH } from "../../src/lib/chem/index";
import type { DesignBufferInput, SolutionPHInput } from "../../src/lib/chem/index";
import { emit, row, stats } from "./lib";

const ROUNDS = 7;
const ROUND_MS = 400;

/** Runs `fn` in timed rounds after a warm-up; returns the rate (calls per second) of each round. */
function rate(fn: (i: number) => number): number[] {
  let sink = 0;
  for (let i = 0; i < 2000; i++) sink += fn(i); // warm-up for the JIT
  const rates: number[] = [];
  for (let r = 0; r < ROUNDS; r++) {
    let n = 0;
    const t0 = performance.now();
    let t = t0;
    while (t - t0 < ROUND_MS) {
      for (let k = 0; k < 100; k++) sink += fn(n++);
      t = performance.now();
    }
    rates.push((n * 1000) / (t - t0));
  }
  if (!Number.isFinite(sink)) throw new Error("benchmark produced a non-finite result");
  return rates;
}

/** The reference kernel: 200 steps of Newton's method on a cubic, the shape of a charge-balance solve without the chemistry. */
function reference(i: number): number {
  let x = 1 + (i & 7);
  for (let k = 0; k < 200; k++) x -= (x * x * x - 2 * x - 5) / (3 * x * x - 2);
  return x;
}

// Vary the inputs a little so that nothing is served from a cache of identical calls.
const phInputs: SolutionPHInput[] = Array.from({ length: 64 }, (_, i) => ({
  components: [
    { reagent: "potassium-dihydrogen-phosphate", concentration_mol_L: 0.01 + 0.0005 * i },
    { reagent: "disodium-hydrogen-phosphate", concentration_mol_L: 0.025 - 0.0002 * i },
  ],
}));
const designInputs: DesignBufferInput[] = Array.from({ length: 64 }, (_, i) => ({
  targetPH: 6.2 + (i % 32) * 0.05,
  volume_mL: 1000,
  reagents: ["potassium-dihydrogen-phosphate", "dipotassium-hydrogen-phosphate"],
  concentration_mM: 25,
  basis: "total",
}));

const fmt = (x: number) => Math.round(x).toLocaleString("en-US");
const ref = stats(rate(reference));
const ph = stats(rate((i) => solutionPH(phInputs[i & 63] as SolutionPHInput).pH));
const design = stats(rate((i) => designBuffer(designInputs[i & 63] as DesignBufferInput).pH));

console.log(`reference kernel (200 Newton steps): median ${fmt(ref.median)} /s`);
console.log(
  `solutionPH (KH2PO4 + Na2HPO4):  median ${fmt(ph.median)} solves/s  (min ${fmt(ph.min)}, max ${fmt(ph.max)}, ${ROUNDS} rounds; target ≥ 50,000)`,
);
console.log(
  `designBuffer (KH2PO4/K2HPO4):   median ${fmt(design.median)} solves/s  (min ${fmt(design.min)}, max ${fmt(design.max)}, ${ROUNDS} rounds; target ≥ 5,000)`,
);
emit([
  row({
    group: "chemistry",
    figure: "solutionPH, phosphate buffer",
    unit: "solves/s",
    stats: ph,
    target: { op: ">=", value: 50_000 },
    baseline: "reference kernel /s",
    ratio: ph.median / ref.median,
  }),
  row({
    group: "chemistry",
    figure: "designBuffer, phosphate pair",
    unit: "solves/s",
    stats: design,
    target: { op: ">=", value: 5_000 },
    baseline: "reference kernel /s",
    ratio: design.median / ref.median,
  }),
]);

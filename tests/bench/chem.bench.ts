/**
 * Throughput of the chemistry library's two hot paths. A plain script, not a
 * test: run it with `npx tsx tests/bench/chem.bench.ts`. Prints the median
 * solves per second over several rounds, for one core.
 *
 * Targets (issue 4): solutionPH on a two-component phosphate buffer
 * ≥ 50,000 /s; designBuffer ≥ 5,000 /s.
 */
import { designBuffer, solutionPH } from '../../src/lib/chem/index';
import type { DesignBufferInput, SolutionPHInput } from '../../src/lib/chem/index';

const ROUNDS = 7;
const ROUND_MS = 400;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 === 1 ? (s[m] ?? 0) : ((s[m - 1] ?? 0) + (s[m] ?? 0)) / 2;
}

/** Runs `fn` in timed rounds; returns the median rate (calls per second). */
function rate(fn: (i: number) => number): { median: number; min: number; max: number } {
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
  if (!Number.isFinite(sink)) throw new Error('benchmark produced a non-finite result');
  return { median: median(rates), min: Math.min(...rates), max: Math.max(...rates) };
}

// Vary the inputs a little so that nothing is served from a cache of identical calls.
const phInputs: SolutionPHInput[] = Array.from({ length: 64 }, (_, i) => ({
  components: [
    { reagent: 'potassium-dihydrogen-phosphate', concentration_mol_L: 0.01 + 0.0005 * i },
    { reagent: 'disodium-hydrogen-phosphate', concentration_mol_L: 0.025 - 0.0002 * i },
  ],
}));
const designInputs: DesignBufferInput[] = Array.from({ length: 64 }, (_, i) => ({
  targetPH: 6.2 + (i % 32) * 0.05,
  volume_mL: 1000,
  reagents: ['potassium-dihydrogen-phosphate', 'dipotassium-hydrogen-phosphate'],
  concentration_mM: 25,
  basis: 'total',
}));

const fmt = (x: number) => Math.round(x).toLocaleString('en-US');
const ph = rate((i) => solutionPH(phInputs[i & 63] as SolutionPHInput).pH);
const design = rate((i) => designBuffer(designInputs[i & 63] as DesignBufferInput).pH);

console.log(`solutionPH (KH2PO4 + Na2HPO4):  median ${fmt(ph.median)} solves/s  (min ${fmt(ph.min)}, max ${fmt(ph.max)}, ${ROUNDS} rounds; target ≥ 50,000)`);
console.log(`designBuffer (KH2PO4/K2HPO4):   median ${fmt(design.median)} solves/s  (min ${fmt(design.min)}, max ${fmt(design.max)}, ${ROUNDS} rounds; target ≥ 5,000)`);

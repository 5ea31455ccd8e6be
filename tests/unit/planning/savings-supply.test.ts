// Savings over the ledger and the reorder arithmetic (pure parts). The savings must equal the
// difference of solventUse over the same injections; the reorder point is the common-practice
// rule use/day × lead time + safety stock.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { solventUse, type ProgramPoint } from "../../../src/lib/chem/solvent-use";
import { variantSaving, type ChannelContent } from "../../../src/lib/planning/savings";
import { runsOutOn, supplyStatus } from "../../../src/lib/planning/supply";

const grad = (flow: number, b0: number, b1: number, minutes: number): ProgramPoint[] => [
  { time_min: 0, flow_mL_min: flow, composition: { A: 100 - b0, B: b0 } },
  { time_min: minutes, flow_mL_min: flow, composition: { A: 100 - b1, B: b1 } },
];
const contents: Record<string, ChannelContent> = {
  A: { mL_per_mL: { water: 0.999, "formic-acid": 0.001 }, g_per_mL: {} },
  B: { mL_per_mL: { acetonitrile: 0.999, "formic-acid": 0.001 }, g_per_mL: {} },
};
const rates = {
  water: { unit: "L" as const, amount_minor: 150, currency: "EUR" },
  acetonitrile: { unit: "L" as const, amount_minor: 4200, currency: "EUR" },
  methanol: { unit: "L" as const, amount_minor: 1900, currency: "EUR" },
  "formic-acid": { unit: "L" as const, amount_minor: 21000, currency: "EUR" },
};
const streams = {
  water: "aqueous",
  acetonitrile: "non-halogenated-organic",
  methanol: "non-halogenated-organic",
  "formic-acid": "acidic-corrosive",
};

describe("variantSaving", () => {
  it("saves exactly the difference of solventUse over the ledger's injections (property)", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 5000 }),
        fc.double({ min: 0.1, max: 2, noNaN: true }),
        fc.double({ min: 0.05, max: 2, noNaN: true }),
        (n, f1, f2) => {
          const current = grad(f1, 5, 95, 10);
          const variant = grad(f2, 5, 95, 7);
          const r = variantSaving({ current, variant, injections: n, contents, rates, streams });
          const expected =
            solventUse({ program: current, injections: n }).total_mL - solventUse({ program: variant, injections: n }).total_mL;
          expect(r.saved.total_mL).toBeCloseTo(expected, 6);
          const byReagent = Object.values(r.saved.byReagent_mL).reduce((a, v) => a + v, 0);
          expect(byReagent).toBeCloseTo(expected, 6);
        },
      ),
      { numRuns: 200, seed: 11 },
    );
  });

  it("moves a swapped solvent's volume to its replacement and prices both at today's rates", () => {
    const current = grad(1, 50, 50, 10); // 5 mL B per injection
    const r = variantSaving({
      current,
      variant: current,
      injections: 100,
      contents,
      rates,
      streams,
      swaps: { B: { acetonitrile: { methanol: 100 } } },
    });
    expect(r.saved.total_mL).toBeCloseTo(0, 9);
    expect(r.saved.byReagent_mL.acetonitrile).toBeCloseTo(499.5, 9);
    expect(r.saved.byReagent_mL.methanol).toBeCloseTo(-499.5, 9);
    // 0.4995 L × (42.00 − 19.00 EUR/L) = 11.49 EUR
    expect(r.saved.cost).toEqual({ amount: Math.round(0.4995 * 4200) - Math.round(0.4995 * 1900), currency: "EUR" });
  });

  it("keeps channels the ledger never named as unassigned", () => {
    const r = variantSaving({ current: grad(1, 0, 0, 10), variant: grad(0.5, 0, 0, 10), injections: 10, contents: {}, rates, streams });
    expect(r.saved.byReagent_mL).toEqual({ "channel:A": 50, "channel:B": 0 });
    expect(r.saved.byStream_mL.unassigned).toBe(50);
    expect(r.saved.cost).toBeNull();
  });
});

describe("supplyStatus", () => {
  it.each([
    // onHand, used30, used90, lead, safety → state, reorder point (use/day = max of the two rates)
    [10_000, 3_000, 4_500, 14, 1_000, "ok", 100 * 14 + 1_000],
    [2_000, 3_000, 4_500, 14, 1_000, "reorder", 2_400],
    [1_000, 3_000, 4_500, 14, 0, "runs-out", 1_400],
    [500, 0, 0, 14, 0, "ok", 0],
  ] as const)("on hand %d, used %d/%d → %s", (onHand, used30, used90, lead, safety, state, reorderPoint) => {
    const s = supplyStatus({ onHand, used30, used90, leadTime_days: lead, safetyStock: safety });
    expect(s.state).toBe(state);
    expect(s.reorderPoint).toBeCloseTo(reorderPoint, 9);
    if (state !== "ok") expect(s.suggestedOrder).toBeCloseTo(reorderPoint + s.perDay * 30 - onHand, 9);
  });

  it("says on which day a reagent runs out", () => {
    const s = supplyStatus({ onHand: 1_000, used30: 3_000, used90: 0, leadTime_days: 7, safetyStock: 0 });
    expect(runsOutOn(s, new Date("2026-12-01T00:00:00Z"))).toBe("2026-12-11");
    expect(runsOutOn(supplyStatus({ onHand: 1, used30: 0, used90: 0, leadTime_days: 7, safetyStock: 0 }), new Date())).toBeNull();
  });
});

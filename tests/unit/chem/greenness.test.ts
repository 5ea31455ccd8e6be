// Method greenness: solvent, waste by stream and the HPLC-EAT score (Gaber et al., Green Chem. 13,
// 2021, 2011; the formula from memory, M). The EHS indices are as copied into a public HPLC-EAT
// calculator (EHS00, C there, paper not seen). No worked example of the paper could be read: the
// score rows are the formula evaluated by hand (D) with the catalogue's 20 °C densities.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { EHS_INDICES, methodGreenness } from "../../../src/lib/chem/greenness";
import { solventUse, type ProgramPoint } from "../../../src/lib/chem/solvent-use";

const iso = (b: number, minutes = 10, flow = 1): ProgramPoint[] => [
  { time_min: 0, flow_mL_min: flow, composition: { A: 100 - b, B: b } },
  { time_min: minutes, flow_mL_min: flow, composition: { A: 100 - b, B: b } },
];

describe("methodGreenness", () => {
  it.each([
    // organic, density 20 °C (catalogue), S + H + E (EHS00): 5 mL per analysis
    ["acetonitrile", 0.7821, 2.724 + 1.056 + 0.772],
    ["methanol", 0.7915, 1.912 + 0.43 + 0.317],
    ["tetrahydrofuran", 0.8892, 1.965 + 0.99 + 0.9],
  ])("50 %% %s at 1 mL/min for 10 min", (organic, density, indices) => {
    const r = methodGreenness({ program: iso(50), injections: 100, solvents: { A: "water", B: organic } });
    expect(r.score.name).toBe("HPLC-EAT");
    // The catalogue's 20 °C density now comes from its temperature correlation (anchored at the
    // checked 25 °C value): within 0.1 % of the table values on these rows.
    expect(Math.abs(r.score.value / (5 * density * indices) - 1)).toBeLessThan(1e-3);
    expect(Math.abs(r.score.total / (500 * density * indices) - 1)).toBeLessThan(1e-3);
    expect(r.solvents_mL).toEqual({ water: 500, [organic]: 500 });
    expect(r.waste_mL).toEqual({ aqueous: 500, "non-halogenated-organic": 500 });
    expect(r.warnings).toEqual([]);
  });

  it("scores acetonitrile worse than methanol per gram, as the indices say", () => {
    const sum = (k: string) => EHS_INDICES[k]!.S + EHS_INDICES[k]!.H + EHS_INDICES[k]!.E;
    expect(sum("acetonitrile")).toBeGreaterThan(sum("methanol"));
    expect(sum("water")).toBe(0);
  });

  it("names unnamed channels and leaves them out of the score", () => {
    const r = methodGreenness({ program: iso(40), injections: 2 });
    expect(r.solvents_mL).toEqual({ "channel:A": 12, "channel:B": 8 });
    expect(r.waste_mL).toEqual({ unassigned: 20 });
    expect(r.score.value).toBe(0);
    expect(r.warnings.map((w) => w.code)).toEqual(["unnamed-channel"]);
  });

  it("solvents add up to solventUse's total (property)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 100 }), fc.integer({ min: 0, max: 100 }), fc.integer({ min: 0, max: 500 }), (b0, b1, n) => {
        const program: ProgramPoint[] = [
          { time_min: 0, flow_mL_min: 0.5, composition: { A: 100 - b0, B: b0 } },
          { time_min: 7, flow_mL_min: 0.7, composition: { A: 100 - b1, B: b1 } },
        ];
        const r = methodGreenness({ program, injections: n, solvents: { A: "water", B: "acetonitrile" } });
        const sum = Object.values(r.solvents_mL).reduce((a, v) => a + v, 0);
        expect(sum).toBeCloseTo(solventUse({ program, injections: n }).total_mL, 6);
      }),
      { numRuns: 200, seed: 7 },
    );
  });
});

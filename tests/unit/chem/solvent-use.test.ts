import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ChemInputError, solventUse } from "../../../src/lib/chem";
import type { ProgramPoint } from "../../../src/lib/chem";

const pt = (time_min: number, flow_mL_min: number, B: number): ProgramPoint => ({ time_min, flow_mL_min, composition: { A: 100 - B, B } });

describe("solventUse against integrals worked by hand", () => {
  it.each([
    // Isocratic 1 mL/min, 30 %B for 10 min: A 7, B 3, total 10 mL.
    ["isocratic", [pt(0, 1, 30), pt(10, 1, 30)], 10, 3],
    // Linear gradient 5→95 %B over 20 min at 0.4 mL/min: V_B = F·t·(φ1+φ2)/2 = 0.4·20·0.5 = 4 mL (check-values §7, D).
    ["gradient at constant flow", [pt(0, 0.4, 5), pt(20, 0.4, 95)], 8, 4],
    // Flow 0.5→1.0 mL/min and B 10→90 % together over 10 min (worked by hand):
    // ∫₀¹⁰ (0.5 + 0.05 t)(0.1 + 0.08 t) dt = ∫₀¹⁰ (0.05 + 0.045 t + 0.004 t²) dt
    //   = 0.5 + 2.25 + 1.3333 = 4.0833 mL of B
    // (a trapezoid of the products would give 10·(0.05 + 0.9)/2 = 4.75 mL); total = 10·(0.5 + 1)/2 = 7.5 mL.
    ["flow and composition change together", [pt(0, 0.5, 10), pt(10, 1, 90)], 7.5, 4.083333333333333],
    // Gradient, hold, step back and re-equilibrate: 0–10 min 1 mL/min 10→50 %B (B 3 mL), 10–12 min hold 50 % (B 1 mL),
    // step to 10 % at 12 min, 12–17 min 10 % (B 0.5 mL): total 17 mL, B 4.5 mL.
    ["gradient, hold, step and re-equilibration", [pt(0, 1, 10), pt(10, 1, 50), pt(12, 1, 50), pt(12, 1, 10), pt(17, 1, 10)], 17, 4.5],
  ])("%s", (_name, program, total, B) => {
    const r = solventUse({ program });
    expect(r.total_mL).toBeCloseTo(total, 10);
    expect(r.byChannel_mL.B).toBeCloseTo(B, 10);
    expect(r.byChannel_mL.A).toBeCloseTo(total - B, 10);
  });

  it("one injection runs the whole program once; n injections n times", () => {
    const program = [pt(0, 0.5, 10), pt(10, 1, 90)];
    const one = solventUse({ program });
    const five = solventUse({ program, injections: 5 });
    expect(five.total_mL).toBeCloseTo(5 * one.total_mL, 10);
    expect(five.byChannel_mL.B).toBeCloseTo(5 * (one.byChannel_mL.B ?? 0), 10);
    expect(solventUse({ program, injections: 0 }).total_mL).toBe(0);
  });

  it("handles three channels and a channel missing at some points (counted as 0 %)", () => {
    const r = solventUse({
      program: [
        { time_min: 0, flow_mL_min: 1, composition: { A: 100 } },
        { time_min: 10, flow_mL_min: 1, composition: { A: 50, B: 30, C: 20 } },
      ],
    });
    expect(r.byChannel_mL).toEqual({ A: expect.closeTo(7.5, 10), B: expect.closeTo(1.5, 10), C: expect.closeTo(1, 10) });
  });
});

describe("invariants (fast-check)", () => {
  const point = fc.record({
    dt: fc.double({ min: 0, max: 30, noNaN: true }),
    flow: fc.double({ min: 0, max: 3, noNaN: true }),
    B: fc.double({ min: 0, max: 100, noNaN: true }),
  });

  it("channels add up to the total, and Simpson’s rule (exact for quadratics) agrees per channel", () => {
    fc.assert(
      fc.property(fc.array(point, { minLength: 1, maxLength: 10 }), (pts) => {
        let t = 0;
        const program = pts.map((p) => {
          t += p.dt;
          return pt(t, p.flow, p.B);
        });
        const r = solventUse({ program });
        expect((r.byChannel_mL.A ?? 0) + (r.byChannel_mL.B ?? 0)).toBeCloseTo(r.total_mL, 9);
        let simpsonB = 0;
        for (let i = 1; i < program.length; i++) {
          const a = program[i - 1];
          const b = program[i];
          if (a === undefined || b === undefined) continue;
          const h = b.time_min - a.time_min;
          const fa = (a.flow_mL_min * (a.composition.B ?? 0)) / 100;
          const fb = (b.flow_mL_min * (b.composition.B ?? 0)) / 100;
          const fm = ((a.flow_mL_min + b.flow_mL_min) / 2) * (((a.composition.B ?? 0) + (b.composition.B ?? 0)) / 200);
          simpsonB += (h / 6) * (fa + 4 * fm + fb);
        }
        expect(r.byChannel_mL.B).toBeCloseTo(simpsonB, 9);
      }),
      { numRuns: 300 },
    );
  });
});

describe("input checks", () => {
  it.each([
    ["decreasing times", [pt(0, 1, 10), pt(5, 1, 20), pt(4, 1, 30)]],
    ["composition not 100 %", [{ time_min: 0, flow_mL_min: 1, composition: { A: 60, B: 30 } }]],
    ["negative flow", [pt(0, -1, 10)]],
    ["empty program", []],
  ])("rejects %s", (_name, program) => {
    expect(() => solventUse({ program })).toThrow(ChemInputError);
  });
});

// Column transfer by the geometric equations (Dolan, LCGC N. Am. 32, 188, 2014; USP <621>,
// harmonised 2022, from memory). No worked example printed with them could be read for these
// tests: the reference rows are the equations evaluated by hand (D), for the transfer that is
// often quoted as the example (150 × 4.6 mm, 5 µm at 1.0 mL/min to 50 × 2.1 mm, 1.7 µm, about
// 0.6 mL/min at the same reduced velocity).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { columnVolume_mL, transferMethod, type ColumnGeometry } from "../../../src/lib/chem/column-transfer";
import type { ProgramPoint } from "../../../src/lib/chem/solvent-use";

const gradient = (points: [number, number, number][]): ProgramPoint[] =>
  points.map(([time_min, flow_mL_min, b]) => ({ time_min, flow_mL_min, composition: { A: 100 - b, B: b } }));
const hplc: ColumnGeometry = { length_mm: 150, diameter_mm: 4.6, particle_um: 5, dwell_mL: 1.0 };
const uhplc: ColumnGeometry = { length_mm: 50, diameter_mm: 2.1, particle_um: 1.7, dwell_mL: 1.0 * (50 / 150) * (2.1 / 4.6) ** 2 };
const method = gradient([
  [0, 1.0, 5],
  [20, 1.0, 95],
  [22, 1.0, 95],
  [22.1, 1.0, 5],
  [27, 1.0, 5],
]);
const codes = (w: { code: string }[]) => w.map((x) => x.code);

describe("transferMethod: the equations evaluated (D)", () => {
  it.each([
    // keep, flow factor (dc2/dc1)² [× dp1/dp2], time factor (L2 dc2²)/(L1 dc1²) / flow factor
    ["linear-velocity", (2.1 / 4.6) ** 2, 50 / 150],
    ["reduced-velocity", (2.1 / 4.6) ** 2 * (5 / 1.7), ((50 / 150) * 1.7) / 5],
  ] as const)("%s", (keep, flowFactor, timeFactor) => {
    const r = transferMethod({ program: method, injection_uL: 10, from: hplc, to: uhplc, keep });
    expect(r.flowFactor).toBeCloseTo(flowFactor, 12);
    expect(r.timeFactor).toBeCloseTo(timeFactor, 12);
    expect(r.injection_uL).toBeCloseTo(10 * (50 / 150) * (2.1 / 4.6) ** 2, 12); // 0.695 µL
    expect(r.program[1]!.time_min).toBeCloseTo(20 * timeFactor, 12);
    expect(r.program[1]!.composition).toEqual(method[1]!.composition);
  });

  it("gives about 0.61 mL/min and a 2.27 min gradient for the usual example at the same reduced velocity", () => {
    const r = transferMethod({ program: method, injection_uL: 10, from: hplc, to: uhplc, keep: "reduced-velocity" });
    expect(r.program[0]!.flow_mL_min).toBeCloseTo(0.613, 3);
    expect(r.program[1]!.time_min).toBeCloseTo(2.267, 3);
    // N ∝ L/dp: 30 000 → 29 412 (−2 %); ΔP ∝ F·L/(dc²·dp²): about × 8.5.
    expect(r.lOverDp.change).toBeCloseTo(50 / 1.7 / 30 - 1, 10);
    expect(r.pressureFactor).toBeCloseTo(0.61297 * (1 / 3) * (4.6 / 2.1) ** 2 * (5 / 1.7) ** 2, 3);
    expect(codes(r.warnings)).toEqual(expect.arrayContaining(["resolution-change", "pressure-increase"]));
    expect(r.hold_min).toBe(0);
    expect(r.injectionDelay_min).toBe(0);
  });

  it("estimates column volume as 0.5·L·dc² (SKD10, from memory: about 1.5 mL for 150 × 4.6 mm)", () => {
    expect(columnVolume_mL(hplc)).toBeCloseTo(1.587, 3);
  });

  it("adds an isocratic hold when the new system's dwell is smaller in column volumes", () => {
    const r = transferMethod({ program: method, injection_uL: 10, from: { ...hplc, dwell_mL: 4 }, to: { ...uhplc, dwell_mL: 0.2 } });
    const missing = 4 * r.volumeFactor - 0.2;
    expect(r.hold_min).toBeCloseTo(missing / r.program[0]!.flow_mL_min, 12);
    expect(r.program[0]!.time_min).toBe(0);
    expect(r.program[1]!.time_min).toBeCloseTo(r.hold_min, 12);
    expect(r.program[1]!.composition).toEqual(method[0]!.composition);
    expect(codes(r.warnings)).toContain("dwell-correction");
  });

  it("delays the injection when the new system's dwell is larger", () => {
    const r = transferMethod({ program: method, injection_uL: 10, from: hplc, to: { ...uhplc, dwell_mL: 0.35 } });
    expect(r.injectionDelay_min).toBeCloseTo((0.35 - 1.0 * r.volumeFactor) / r.program[0]!.flow_mL_min, 12);
    expect(r.program).toHaveLength(method.length);
  });

  it("refuses a column without a length, naming the field", () => {
    expect(() => transferMethod({ program: method, injection_uL: 5, from: hplc, to: { ...uhplc, length_mm: 0 } })).toThrow(
      /^to\.length_mm/,
    );
  });
});

describe("transferMethod round trips and properties", () => {
  it.each(["linear-velocity", "reduced-velocity"] as const)("A → B → A returns the program within rounding (%s)", (keep) => {
    const there = transferMethod({ program: method, injection_uL: 10, from: hplc, to: uhplc, keep });
    const back = transferMethod({ program: there.program, injection_uL: there.injection_uL, from: uhplc, to: hplc, keep });
    expect(back.injection_uL).toBeCloseTo(10, 9);
    back.program.forEach((p, i) => {
      expect(p.time_min).toBeCloseTo(method[i]!.time_min, 9);
      expect(p.flow_mL_min).toBeCloseTo(method[i]!.flow_mL_min, 9);
      expect(p.composition).toEqual(method[i]!.composition);
    });
  });

  const column = fc.record({
    length_mm: fc.double({ min: 20, max: 300, noNaN: true }),
    diameter_mm: fc.double({ min: 1, max: 10, noNaN: true }),
    particle_um: fc.double({ min: 1.3, max: 10, noNaN: true }),
  });
  const program = fc
    .array(
      fc.tuple(
        fc.double({ min: 0.1, max: 10, noNaN: true }),
        fc.double({ min: 0.05, max: 3, noNaN: true }),
        fc.integer({ min: 0, max: 100 }),
      ),
      {
        minLength: 2,
        maxLength: 8,
      },
    )
    .map((rows) => {
      let t = 0;
      return rows.map(([dt, flow, b], i) => {
        if (i > 0) t += dt;
        return { time_min: t, flow_mL_min: flow, composition: { A: 100 - b, B: b } };
      });
    });

  it("keeps every segment's gradient volume in column volumes (property)", () => {
    fc.assert(
      fc.property(program, column, column, fc.constantFrom("linear-velocity" as const, "reduced-velocity" as const), (prog, a, b, keep) => {
        const from = { ...a, dwell_mL: 0 };
        const to = { ...b, dwell_mL: 0 };
        const r = transferMethod({ program: prog, injection_uL: 5, from, to, keep });
        const cv = (p: ProgramPoint[], c: ColumnGeometry, i: number) =>
          ((p[i + 1]!.time_min - p[i]!.time_min) * (p[i]!.flow_mL_min + p[i + 1]!.flow_mL_min)) / 2 / columnVolume_mL(c);
        for (let i = 0; i + 1 < prog.length; i++) {
          const before = cv(prog, from, i);
          expect(cv(r.program, to, i)).toBeCloseTo(before, 6);
          // the composition change per column volume (the gradient's steepness) is the same too
          const dB = prog[i + 1]!.composition.B - prog[i]!.composition.B;
          expect(r.program[i + 1]!.composition.B! - r.program[i]!.composition.B!).toBe(dB);
        }
      }),
      { numRuns: 300, seed: 20261204 },
    );
  });
});

import { describe, expect, it } from "vitest";
import type { ProgramPoint } from "../../../src/lib/chem";
import { adjustGradientProgram, gradientSegment, isocraticProgram, pointAt, whatIf } from "../../../src/lib/ledger/what-if";

const AB = (B: number) => ({ A: 100 - B, B });
const point = (time_min: number, B: number, flow_mL_min = 1): ProgramPoint => ({ time_min, flow_mL_min, composition: AB(B) });

// A 5 → 95 % B gradient over 20 min at 1 mL/min, a 2 min wash, a step back and 4.9 min re-equilibration.
const GRADIENT: ProgramPoint[] = [point(0, 5), point(20, 95), point(22, 95), point(22.1, 5), point(27, 5)];
// An isocratic method at 40 % B for 15 min.
const ISOCRATIC: ProgramPoint[] = [point(0, 40), point(15, 40)];

// Scouting runs made from log kw = 2.6, S = 4, t0 = 1 min (worked by hand):
// 40 % B: log k = 2.6 − 1.6 = 1.0, k = 10, tR = 1·(1 + 10) = 11 min;
// 50 % B: log k = 0.6, k = 10^0.6 = 3.98107, tR = 4.98107 min.
const SCOUTING = [
  { percentB: 40, retention_min: 11 },
  { percentB: 50, retention_min: 4.98107 },
];

describe("whatIf, isocratic (worked by hand)", () => {
  it.each([
    // target %B, k, tR (min), run time with a 2 min margin, B per injection (mL), total per 100 injections (mL)
    // 30 % B: log k = 2.6 − 1.2 = 1.4, k = 25.1189, tR = 26.1189; run 28.1189 min; B = 0.30 × 28.1189 = 8.4357 mL
    [30, 25.1189, 26.1189, 28.1189, 8.4357, 2811.89],
    // 40 % B: back to the scouting run itself; run 13 min; B = 0.40 × 13 = 5.2 mL
    [40, 10, 11, 13, 5.2, 1300],
    // 45 % B: log k = 0.8, k = 6.30957, tR = 7.30957; run 9.30957; B = 0.45 × 9.30957 = 4.18931 mL
    [45, 6.30957, 7.30957, 9.30957, 4.18931, 930.957],
  ])("at %s %% B: k %s, last peak %s min, run %s min, B %s mL/injection, %s mL per 100", (target, k, tR, run, bPerInjection, per100) => {
    const r = whatIf({ runs: SCOUTING, deadTime_min: 1, targetPercentB: target, margin_min: 2, program: ISOCRATIC });
    expect(r.fit.S).toBeCloseTo(4, 4);
    expect(r.fit.logKw).toBeCloseTo(2.6, 4);
    expect(r.isocratic.k).toBeCloseTo(k, 3);
    expect(r.isocratic.retention_min).toBeCloseTo(tR, 3);
    expect(r.isocratic.runTime_min).toBeCloseTo(run, 3);
    expect(r.isocratic.perInjection.byChannel_mL.B).toBeCloseTo(bPerInjection, 3);
    expect(r.isocratic.perInjection.total_mL).toBeCloseTo(run, 3); // 1 mL/min × run time
    expect(r.isocratic.per100.total_mL).toBeCloseTo(per100, 1);
    expect(r.gradient).toBeNull(); // %B never rises in the isocratic method
  });

  it("−10 % B raises k by 10^(0.1·S) = 2.512 at S = 4 (Snyder, Kirkland & Dolan 2010: about 2.5–3×)", () => {
    const at40 = whatIf({ runs: SCOUTING, deadTime_min: 1, targetPercentB: 40, margin_min: 0, program: ISOCRATIC });
    const at30 = whatIf({ runs: SCOUTING, deadTime_min: 1, targetPercentB: 30, margin_min: 0, program: ISOCRATIC });
    expect(at30.isocratic.k / at40.isocratic.k).toBeCloseTo(2.512, 3);
  });

  it("keeps the method as it is for comparison: 15 min at 1 mL/min is 15 mL, 1500 mL per 100", () => {
    const r = whatIf({ runs: SCOUTING, deadTime_min: 1, targetPercentB: 30, margin_min: 2, program: ISOCRATIC });
    expect(r.current.runTime_min).toBe(15);
    expect(r.current.perInjection.total_mL).toBeCloseTo(15, 9);
    expect(r.current.per100.byChannel_mL.B).toBeCloseTo(600, 6); // 0.40 × 15 × 100
  });

  it.each([
    [{ percentB: 30, retention_min: 0.5 }, "runs[1].retention_min"], // before the dead time
    [{ percentB: 40, retention_min: 6 }, "runs"], // both runs at the same %B
  ])("refuses scouting runs the model cannot take (%o → field %s)", (second, field) => {
    expect(() => whatIf({ runs: [SCOUTING[0]!, second], deadTime_min: 1, targetPercentB: 30, margin_min: 2, program: ISOCRATIC })).toThrow(
      expect.objectContaining({ field }),
    );
  });

  it("warns for an extrapolation outside the scouting runs and for k below 1", () => {
    const r = whatIf({ runs: SCOUTING, deadTime_min: 1, targetPercentB: 70, margin_min: 2, program: ISOCRATIC });
    // 70 % B: log k = 2.6 − 2.8 = −0.2, k = 0.631
    expect(r.isocratic.k).toBeCloseTo(0.631, 3);
    expect(r.warnings.join(" ")).toMatch(/extrapolation/);
    expect(r.warnings.join(" ")).toMatch(/close to the dead time/);
  });
});

describe("whatIf, under the method's gradient", () => {
  // check-values §7 (worked by hand there): V_m 1.5 mL, F 1 mL/min (t0 1.5 min), t_G 20 min, Δφ 0.9,
  // S 4, k0 1000, t_D 1 min → b 0.270, k* 3.22, t_R 18.02 min. k0 = 1000 at φ0 = 0.05 means
  // log kw = 3 + 4 × 0.05 = 3.2. Scouting runs from log kw 3.2, S 4, t0 1.5 (worked by hand):
  // 40 % B: k = 10^1.6 = 39.8107, tR = 1.5 × 40.8107 = 61.2161; 60 % B: k = 10^0.8 = 6.30957, tR = 10.9644.
  const runs = [
    { percentB: 40, retention_min: 61.2161 },
    { percentB: 60, retention_min: 10.9644 },
  ];
  const r = whatIf({ runs, deadTime_min: 1.5, targetPercentB: 50, margin_min: 5, program: GRADIENT, dwell_mL: 1 });

  it("reproduces the check values: b 0.270, k* 3.22, t_R 18.02 min", () => {
    expect(r.fit.S).toBeCloseTo(4, 3);
    expect(r.gradient).not.toBeNull();
    expect(r.gradient!.b).toBeCloseTo(0.27, 3);
    expect(r.gradient!.kStar).toBeCloseTo(3.22, 2);
    expect(r.gradient!.retention_min).toBeCloseTo(18.02, 2);
    expect(r.gradient!.segment).toEqual({ start_min: 0, end_min: 20, from_percentB: 5, to_percentB: 95 });
    expect(r.gradient!.elutesAfterGradient).toBe(false);
  });

  it("cuts the gradient at the last peak and fits the wash and re-equilibration into the margin (worked by hand)", () => {
    const g = r.gradient!;
    const tR = g.retention_min; // 18.022
    expect(g.runTime_min).toBeCloseTo(tR + 5, 9);
    // The rows after the gradient (offsets 2, 2.1, 7 min) are scaled by 5/7 → 1.4286, 1.5, 5 min after the cut.
    [0, 18.022, 19.4506, 19.522, 23.022].forEach((t, i) => expect(g.program[i]!.time_min).toBeCloseTo(t, 3));
    expect(g.program).toHaveLength(5);
    // %B at the cut: 5 + 90 × 18.0221 / 20 = 86.0995
    expect(g.program[1]!.composition.B).toBeCloseTo(86.0995, 3);
    // 1 mL/min throughout: total = run time, 23.022 mL; per 100: 2302.2 mL
    expect(g.perInjection.total_mL).toBeCloseTo(23.0221, 3);
    expect(g.per100.total_mL).toBeCloseTo(2302.21, 1);
    // B by hand: 18.0221 × (5 + 86.0995)/2 % = 8.2091; 1.4286 × (86.0995 + 95)/2 % = 1.2936;
    // 0.07143 × (95 + 5)/2 % = 0.0357; 3.5 × 5 % = 0.175 → 9.7134 mL
    expect(g.perInjection.byChannel_mL.B).toBeCloseTo(9.7134, 2);
  });

  it("the method as it is: 27 min at 1 mL/min = 27 mL; B = 10 + 1.9 + 0.05 + 0.245 = 12.195 mL (worked by hand)", () => {
    expect(r.current.perInjection.total_mL).toBeCloseTo(27, 9);
    expect(r.current.perInjection.byChannel_mL.B).toBeCloseTo(12.195, 6);
  });

  it("a peak that leaves after the gradient's end holds the final composition up to it", () => {
    const late = adjustGradientProgram(GRADIENT, gradientSegment(GRADIENT)!, 24, 7);
    expect(late.map((p) => p.time_min)).toEqual([0, 20, 24, 26, 26.1, 31]);
    expect(late.map((p) => p.composition.B)).toEqual([5, 95, 95, 95, 5, 5]);
  });
});

describe("program helpers", () => {
  it("finds the first rising stretch of %B, after an initial hold", () => {
    expect(gradientSegment([point(0, 10), point(2, 10), point(12, 60), point(14, 90), point(15, 90)])).toEqual({
      start_min: 2,
      end_min: 14,
      from_percentB: 10,
      to_percentB: 90,
    });
    expect(gradientSegment(ISOCRATIC)).toBeNull();
  });

  it("interpolates flow and composition between points", () => {
    const p = pointAt([point(0, 10, 0.5), point(10, 60, 1.5)], 4);
    expect(p.flow_mL_min).toBeCloseTo(0.9, 9); // 0.5 + 0.4 × 1.0
    expect(p.composition.B).toBeCloseTo(30, 9); // 10 + 0.4 × 50
  });

  it("an isocratic program is two points at one composition", () => {
    expect(isocraticProgram(35, 0.4, 12)).toEqual([point(0, 35, 0.4), point(12, 35, 0.4)]);
  });
});

// A variant built from a method: solvent change then column change, with the LSS what-if carried
// across. The expectations follow from the relations themselves (D): the iso-eluotropic change
// keeps k at the mapped composition, and a geometric transfer scales every time by one factor.
import { describe, expect, it } from "vitest";
import type { ProgramPoint } from "../../../src/lib/chem/solvent-use";
import { toMethanolEquivalent } from "../../../src/lib/chem/substitution";
import { buildVariant, greennessOf } from "../../../src/lib/planning/variant";

const isocratic: ProgramPoint[] = [
  { time_min: 0, flow_mL_min: 1, composition: { A: 60, B: 40 } },
  { time_min: 15, flow_mL_min: 1, composition: { A: 60, B: 40 } },
];
const scouting = {
  runs: [
    { percentB: 40, retention_min: 11 },
    { percentB: 50, retention_min: 4.98107 },
  ],
  deadTime_min: 1,
};
const solvents = { A: "water", B: "acetonitrile" };

describe("buildVariant", () => {
  it("keeps the last peak where it was when only the organic solvent changes (isocratic)", () => {
    const v = buildVariant(
      isocratic,
      { substitution: { from: "acetonitrile", to: "methanol", channel: "B", aqueous: "A" }, scouting },
      solvents,
      3,
    );
    expect(v.program[0]!.composition.B).toBeCloseTo(100 * toMethanolEquivalent("acetonitrile", 0.4), 9);
    expect(v.solvents).toEqual({ A: "water", B: "methanol" });
    expect(v.prediction!.current.lastPeak_min).toBeCloseTo(11, 6);
    expect(v.prediction!.variant.lastPeak_min).toBeCloseTo(11, 6);
  });

  it("scales the last peak and every time by the column's time factor", () => {
    const transfer = {
      from: { length_mm: 150, diameter_mm: 4.6, particle_um: 5, dwell_mL: 0 },
      to: { length_mm: 75, diameter_mm: 4.6, particle_um: 2.5, dwell_mL: 0 },
      keep: "linear-velocity" as const,
      injection_uL: 10,
    };
    const v = buildVariant(isocratic, { transfer, scouting }, solvents, 3);
    expect(v.transfer!.timeFactor).toBeCloseTo(0.5, 12);
    expect(v.injection_uL).toBeCloseTo(5, 12);
    expect(v.prediction!.variant.lastPeak_min).toBeCloseTo(v.prediction!.current.lastPeak_min * 0.5, 6);
    expect(v.program[1]!.time_min).toBeCloseTo(7.5, 12);
  });

  it("scores a blend by splitting its channel, and the solvents still add up", () => {
    const v = buildVariant(
      isocratic,
      { substitution: { from: "acetonitrile", to: { methanol: 50, acetonitrile: 50 }, channel: "B", aqueous: "A" } },
      solvents,
      3,
    );
    const g = greennessOf(v.program, 10, v.solvents, v.blend);
    const b = v.program[0]!.composition.B!;
    expect(g.solvents_mL.methanol).toBeCloseTo((15 * 10 * b) / 200, 9);
    expect(g.solvents_mL.acetonitrile).toBeCloseTo((15 * 10 * b) / 200, 9);
    expect(Object.values(g.solvents_mL).reduce((a, x) => a + x, 0)).toBeCloseTo(150, 9);
  });
});

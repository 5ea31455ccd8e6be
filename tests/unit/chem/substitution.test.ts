// Solvent substitution at equal eluent strength. The relation is Schoenmakers, Billiet & de Galan,
// J. Chromatogr. 205, 13 (1981), as remembered (M): no worked example published with it could be
// found for these tests, so the reference rows below evaluate the relation as published (D from M)
// and the round trips check that the code inverts it exactly.
import { describe, expect, it } from "vitest";
import {
  fromMethanolEquivalent,
  lssStrengthRatio,
  substituteSolvent,
  toMethanolEquivalent,
  type OrganicModifier,
} from "../../../src/lib/chem/substitution";
import type { ProgramPoint } from "../../../src/lib/chem/solvent-use";

const gradient = (points: [number, number, number][]): ProgramPoint[] =>
  points.map(([time_min, flow_mL_min, b]) => ({ time_min, flow_mL_min, composition: { A: 100 - b, B: b } }));
const codes = (w: { code: string }[]) => w.map((x) => x.code);

describe("iso-eluotropic relation (Schoenmakers et al. 1981, from memory)", () => {
  it.each([
    // φ(MeOH), modifier, φ(modifier): evaluated from the relation (D from M)
    [0.5, "acetonitrile", 0.365],
    [1.0, "acetonitrile", 0.89],
    [0.5, "tetrahydrofuran", 0.33],
    [1.0, "tetrahydrofuran", 0.66],
    [0.4, "methanol", 0.4],
  ] as [number, OrganicModifier, number][])("%f methanol ≈ %s %f", (phiM, modifier, phi) => {
    expect(fromMethanolEquivalent(modifier, phiM)).toBeCloseTo(phi, 10);
    expect(toMethanolEquivalent(modifier, phi)).toBeCloseTo(phiM, 10);
  });

  // Common-practice orientation (from memory, not a source): about 10 % more methanol than
  // acetonitrile is needed near 40–60 % organic; the relation must give the same direction.
  it("needs more methanol than acetonitrile, and less tetrahydrofuran", () => {
    for (const phi of [0.2, 0.4, 0.6]) {
      expect(toMethanolEquivalent("acetonitrile", phi)).toBeGreaterThan(phi);
      expect(fromMethanolEquivalent("tetrahydrofuran", toMethanolEquivalent("acetonitrile", phi))).toBeLessThan(phi);
    }
  });

  it("carries an LSS S value by Snyder's solvent strengths (3.2 acetonitrile, 3.0 methanol; from memory)", () => {
    expect(lssStrengthRatio("acetonitrile", "methanol")).toBeCloseTo(3.0 / 3.2, 10);
  });
});

describe("substituteSolvent", () => {
  const scout = gradient([
    [0, 0.4, 5],
    [10, 0.4, 80],
    [11, 0.4, 80],
    [11.1, 0.4, 5],
    [15, 0.4, 5],
  ]);

  it("converts channel B point by point; A takes the rest", () => {
    const { program } = substituteSolvent({ program: scout, from: "acetonitrile", to: "methanol" });
    program.forEach((p, i) => {
      const phiM = toMethanolEquivalent("acetonitrile", (scout[i]!.composition.B ?? 0) / 100);
      expect(p.composition.B).toBeCloseTo(100 * phiM, 9);
      expect((p.composition.A ?? 0) + (p.composition.B ?? 0)).toBeCloseTo(100, 9);
      expect(p.time_min).toBe(scout[i]!.time_min);
      expect(p.flow_mL_min).toBe(scout[i]!.flow_mL_min);
    });
  });

  it.each(["methanol", "tetrahydrofuran"] as OrganicModifier[])("acetonitrile → %s → acetonitrile returns the program", (to) => {
    const there = substituteSolvent({ program: scout, from: "acetonitrile", to }).program;
    const back = substituteSolvent({ program: there, from: to, to: "acetonitrile" }).program;
    back.forEach((p, i) => {
      expect(p.composition.B).toBeCloseTo(scout[i]!.composition.B!, 9);
      expect(p.composition.A).toBeCloseTo(scout[i]!.composition.A!, 9);
    });
  });

  it("a 50/50 methanol–acetonitrile blend needs the harmonic mix of the two binaries", () => {
    const iso = gradient([
      [0, 1, 50],
      [5, 1, 50],
    ]);
    const { program, to } = substituteSolvent({ program: iso, from: "methanol", to: { methanol: 50, acetonitrile: 50 } });
    expect(to).toEqual({ methanol: 50, acetonitrile: 50 });
    // 1 / (0.5/0.5 + 0.5/0.365) (D from the relation)
    expect(program[0]!.composition.B).toBeCloseTo(100 / (1 + 0.5 / 0.365), 9);
  });

  it("holds points that the new solvent cannot reach, and says so", () => {
    const strong = gradient([
      [0, 0.4, 5],
      [10, 0.4, 95],
    ]);
    const r = substituteSolvent({ program: strong, from: "acetonitrile", to: "methanol" });
    expect(r.program[1]!.composition.B).toBe(100);
    expect(r.program[1]!.composition.A).toBeCloseTo(0, 12);
    expect(codes(r.warnings)).toEqual(expect.arrayContaining(["strength-unreachable", "relation-extrapolated", "selectivity-change"]));
  });

  it("warns about the methanol–water viscosity maximum, the UV cutoff and methanol's toxicity", () => {
    const r = substituteSolvent({ program: scout, from: "acetonitrile", to: "methanol", detection_nm: 210 });
    const byCode = Object.fromEntries(r.warnings.map((w) => [w.code, w.message]));
    expect(byCode["viscosity-maximum"]).toMatch(/40–50 %/);
    // Methanol's UV cutoff 205 nm (SKD10 App. I, from memory): 210 nm is within 10 nm.
    expect(byCode["uv-cutoff"]).toMatch(/205 nm/);
    expect(byCode["solvent-handling"]).toMatch(/H370/);
    const below = substituteSolvent({ program: scout, from: "acetonitrile", to: "methanol", detection_nm: 200 });
    expect(below.warnings.find((w) => w.code === "uv-cutoff")?.message).toMatch(/at or above the method's 200 nm/);
  });

  it("warns that phosphate may precipitate in organic-rich mixes and that salts must be flushed first", () => {
    const high = gradient([
      [0, 1, 10],
      [20, 1, 75],
    ]);
    const r = substituteSolvent({
      program: high,
      from: "acetonitrile",
      to: "tetrahydrofuran",
      aqueousSolutes: ["potassium-dihydrogen-phosphate"],
    });
    // 75 % acetonitrile ≈ 58 % THF: below the 60 % limit (Schellinger & Carr 2004, from memory).
    expect(codes(r.warnings)).not.toContain("precipitation-risk");
    expect(codes(r.warnings)).toEqual(expect.arrayContaining(["miscibility", "solvent-handling"]));
    const methanol = substituteSolvent({
      program: high,
      from: "acetonitrile",
      to: "methanol",
      aqueousSolutes: ["potassium-dihydrogen-phosphate"],
    });
    expect(methanol.program[1]!.composition.B).toBeGreaterThan(80);
    expect(codes(methanol.warnings)).toContain("precipitation-risk");
  });

  it("refuses what it cannot convert, naming the field", () => {
    expect(() => substituteSolvent({ program: scout, from: "acetonitrile", to: "acetone" as OrganicModifier })).toThrow(/^to:/);
    expect(() => substituteSolvent({ program: scout, from: "acetonitrile", to: { methanol: 60 } })).toThrow(/100 %/);
  });
});

import { describe, expect, it } from "vitest";
import { solventUse } from "../../../src/lib/chem";
import { compositionFromSpec } from "../../../src/lib/ledger/composition";
import { programChannels, programToRows, rowsToProgram } from "../../../src/lib/ledger/program";
import { splitVolume, type BatchComposition } from "../../../src/lib/ledger/split";

// 0.1 % formic acid in water, as the demo batch B26-1103 was made: 4000 mL water + 4 mL formic acid.
const formicWater: BatchComposition = {
  volume_mL: 4000,
  parts: [
    { reagentId: "water", unit: "mL", amount: 4000 },
    { reagentId: "formic-acid", unit: "mL", amount: 4 },
  ],
};
// 25 mM phosphate: 1000 mL water with 3.4021 g KH2PO4.
const phosphate: BatchComposition = {
  volume_mL: 1000,
  parts: [
    { reagentId: "water", unit: "mL", amount: 1000 },
    { reagentId: "potassium-dihydrogen-phosphate", unit: "g", amount: 3.4021 },
  ],
};

describe("splitVolume: per-reagent shares of a channel volume", () => {
  it.each([
    // [volume, composition, expected shares] — worked by hand
    // 47.264 × 4/4004 = 0.047216… → 0.0472; water takes the rest: 47.2168
    [
      47.264,
      formicWater,
      [
        { reagentId: "water", volume_mL: 47.2168, mass_g: null },
        { reagentId: "formic-acid", volume_mL: 0.0472, mass_g: null },
      ],
    ],
    // 1001 mL of the same mix: exactly 1000 + 1
    [
      1001,
      formicWater,
      [
        { reagentId: "water", volume_mL: 1000, mass_g: null },
        { reagentId: "formic-acid", volume_mL: 1, mass_g: null },
      ],
    ],
    // 250 mL of phosphate: 250 mL water; 3.4021 g/L × 0.25 L = 0.850525 g → 0.85053 g (5 dp)
    [
      250,
      phosphate,
      [
        { reagentId: "water", volume_mL: 250, mass_g: null },
        { reagentId: "potassium-dihydrogen-phosphate", volume_mL: 0, mass_g: 0.85053 },
      ],
    ],
  ] as const)("%s mL", (volume, composition, expected) => {
    expect(splitVolume(volume, composition)).toEqual(expected);
  });

  it("liquid shares always add up to the channel volume (rounded to 0.0001 mL)", () => {
    const thirds: BatchComposition = {
      volume_mL: 3,
      parts: [
        { reagentId: "water", unit: "mL", amount: 1 },
        { reagentId: "methanol", unit: "mL", amount: 1 },
        { reagentId: "acetonitrile", unit: "mL", amount: 1 },
      ],
    };
    for (const v of [0.0001, 1, 10, 33.3333, 100.00007]) {
      const shares = splitVolume(v, thirds);
      const sum = shares.reduce((a, s) => a + Math.round(s.volume_mL * 10_000), 0);
      expect(sum).toBe(Math.round(v * 10_000));
    }
  });

  it("refuses a composition without a liquid", () => {
    expect(() => splitVolume(10, { volume_mL: 1000, parts: [{ reagentId: "tris", unit: "g", amount: 1 }] })).toThrow(/no liquid/);
  });
});

describe("compositionFromSpec", () => {
  it("reads a recipe specification with an additive per litre", () => {
    const c = compositionFromSpec(
      { solvents: [{ reagent: "acetonitrile", percent: 100 }], additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" }] },
      1000,
    );
    const byId = Object.fromEntries(c.parts.map((p) => [p.reagentId, p]));
    expect(byId.acetonitrile?.amount).toBeCloseTo(1000, 6);
    expect(byId["formic-acid"]?.unit).toBe("mL");
    // 0.1 % v/v of about 1 L of final mix ≈ 1 mL (the mix's estimated final volume may differ slightly)
    expect(byId["formic-acid"]?.amount).toBeGreaterThan(0.95);
    expect(byId["formic-acid"]?.amount).toBeLessThan(1.05);
  });
});

describe("the gradient table ↔ the pump program", () => {
  const rows = [
    { time_min: 0, flow_mL_min: 0.4, B: 5, C: 0, D: 0 },
    { time_min: 10, flow_mL_min: 0.4, B: 95, C: 0, D: 0 },
    { time_min: 15, flow_mL_min: 0.4, B: 95, C: 0, D: 0 },
  ];
  it("puts the remainder on A and leaves out channels at 0 % throughout", () => {
    const program = rowsToProgram(rows);
    expect(program[0]).toEqual({ time_min: 0, flow_mL_min: 0.4, composition: { A: 95, B: 5 } });
    expect(programChannels(program)).toEqual(["A", "B"]);
    expect(programToRows(program)).toEqual(rows);
  });

  it("feeds solventUse: 0–10 min 5→95 % B at 0.4 mL/min, then 5 min at 95 % B", () => {
    // Worked by hand: B = 10 × 0.4 × 0.50 + 5 × 0.4 × 0.95 = 2.0 + 1.9 = 3.9 mL; total 15 × 0.4 = 6 mL; A = 2.1 mL
    const use = solventUse({ program: rowsToProgram(rows) });
    expect(use.total_mL).toBeCloseTo(6, 10);
    expect(use.byChannel_mL.B).toBeCloseTo(3.9, 10);
    expect(use.byChannel_mL.A).toBeCloseTo(2.1, 10);
  });
});

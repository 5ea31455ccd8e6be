import { describe, expect, it } from "vitest";
import { mixtureProperties } from "../../../src/lib/chem";

describe("mixtureProperties", () => {
  it.each([
    // Water–organic viscosity at 25 °C, v/v % organic (check-values §5, C, lcqc tables)
    ["methanol", 0, 0.89],
    ["methanol", 40, 1.62],
    ["methanol", 100, 0.56],
    ["acetonitrile", 10, 1.01],
    ["acetonitrile", 50, 0.82],
    ["acetonitrile", 100, 0.35],
  ])("viscosity of %s %s %% in water is %s cP at 25 °C", (organic, pct, cP) => {
    const r = mixtureProperties({
      solvents: [
        { reagent: "water", percent: 100 - pct },
        { reagent: organic, percent: pct },
      ],
    });
    expect(r.viscosity_cP).toBeCloseTo(cP, 6);
  });

  it("interpolates between table rows and stays between their values", () => {
    // MeOH–water 20 % 1.40 and 30 % 1.56 cP (check-values §5): 25 % lies between them.
    const v =
      mixtureProperties({
        solvents: [
          { reagent: "water", percent: 75 },
          { reagent: "methanol", percent: 25 },
        ],
      }).viscosity_cP ?? 0;
    expect(v).toBeGreaterThan(1.4);
    expect(v).toBeLessThan(1.56);
  });

  it("weights P′ by volume fraction: 50/50 ACN–water is (10.2 + 5.8)/2 = 8.0 (Snyder 1978 values, from memory)", () => {
    expect(
      mixtureProperties({
        solvents: [
          { reagent: "water", percent: 50 },
          { reagent: "acetonitrile", percent: 50 },
        ],
      }).polarityIndex,
    ).toBeCloseTo(8.0, 9);
  });

  it("takes the highest UV cutoff of the components present", () => {
    const r = mixtureProperties({
      solvents: [
        { reagent: "water", percent: 60 },
        { reagent: "acetonitrile", percent: 30 },
        { reagent: "tetrahydrofuran", percent: 10 },
      ],
    });
    expect(r.uvCutoff_nm).toBe(212);
    const noThf = mixtureProperties({
      solvents: [
        { reagent: "water", percent: 60 },
        { reagent: "acetonitrile", percent: 40 },
        { reagent: "tetrahydrofuran", percent: 0 },
      ],
    });
    expect(noThf.uvCutoff_nm).toBe(190);
  });

  it.each([
    [
      "a ternary mix",
      [
        { reagent: "water", percent: 60 },
        { reagent: "acetonitrile", percent: 30 },
        { reagent: "methanol", percent: 10 },
      ],
      25,
    ],
    [
      "THF–water",
      [
        { reagent: "water", percent: 60 },
        { reagent: "tetrahydrofuran", percent: 40 },
      ],
      25,
    ],
    [
      "MeOH–water at 40 °C",
      [
        { reagent: "water", percent: 60 },
        { reagent: "methanol", percent: 40 },
      ],
      40,
    ],
  ])("omits the viscosity for %s and says so", (_name, solvents, t) => {
    const r = mixtureProperties({ solvents, temperature_C: t });
    expect(r.viscosity_cP).toBeUndefined();
    expect(r.warnings.map((w) => w.code)).toEqual(["no-viscosity-data"]);
  });
});

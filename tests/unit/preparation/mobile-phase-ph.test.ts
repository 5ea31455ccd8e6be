import { describe, expect, it } from "vitest";
import { mobilePhasePHReport } from "../../../src/lib/preparation/mobile-phase-ph";
import type { RecipeSpec } from "../../../src/lib/schemas/recipes";

const base: Pick<RecipeSpec, "additives" | "labile"> = { additives: [], labile: false };

describe("the pH of a recipe's mobile phase on the recipe and batch pages", () => {
  it("a 20 mM acetate buffer at pH 4.76 with 30 % acetonitrile: w_w pH is the target, s_s and s_w above it", () => {
    const spec: RecipeSpec = {
      ...base,
      solvents: [
        { reagent: "water", percent: 70 },
        { reagent: "acetonitrile", percent: 30 },
      ],
      buffer: { reagents: ["acetic-acid", "sodium-acetate"], targetPH: 4.76, concentration_mM: 20, basis: "total", temperature_C: 25 },
    };
    const r = mobilePhasePHReport(spec);
    expect(r.result?.wwPH).toBeCloseTo(4.76, 3);
    expect(r.result?.ssPH ?? 0).toBeGreaterThan(5.2);
    expect(r.result?.swPH ?? 0).toBeGreaterThan(5.2);
    expect(r.organic).toEqual({ reagent: "acetonitrile", name: "Acetonitrile", percent: 30 });
    expect(r.limits.join(" ")).toMatch(/Bates–Guggenheim/);
  });

  it("0.1 % formic acid in water/methanol 50/50: the acid goes into the water first, then is diluted by the methanol", () => {
    const spec: RecipeSpec = {
      solvents: [
        { reagent: "water", percent: 50 },
        { reagent: "methanol", percent: 50 },
      ],
      additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" }],
      labile: false,
    };
    const r = mobilePhasePHReport(spec);
    // In the water alone it is twice as concentrated as in the mix: 0.2 % ≈ 53 mM, pH about 2.5 (pKa 3.745).
    expect(r.result?.wwPH ?? 0).toBeGreaterThan(2.4);
    expect(r.result?.wwPH ?? 0).toBeLessThan(2.6);
    expect(r.result?.ssPH ?? 0).toBeGreaterThan(r.result?.wwPH ?? 99);
  });

  it("says why nothing is computed: no water, no acid or base, or a ternary mix", () => {
    expect(mobilePhasePHReport({ ...base, solvents: [{ reagent: "acetonitrile", percent: 100 }] }).note).toMatch(/No water/);
    expect(
      mobilePhasePHReport({
        ...base,
        solvents: [
          { reagent: "water", percent: 50 },
          { reagent: "acetonitrile", percent: 50 },
        ],
      }).note,
    ).toMatch(/No acid/);
    const ternary = mobilePhasePHReport({
      solvents: [
        { reagent: "water", percent: 50 },
        { reagent: "acetonitrile", percent: 25 },
        { reagent: "methanol", percent: 25 },
      ],
      additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" }],
      labile: false,
    });
    expect(ternary.result).toBeNull();
    expect(ternary.note).toMatch(/one organic solvent/);
  });

  it("beyond 60 % acetonitrile only the aqueous pH is given, with the reason", () => {
    const r = mobilePhasePHReport({
      solvents: [
        { reagent: "water", percent: 20 },
        { reagent: "acetonitrile", percent: 80 },
      ],
      additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" }],
      labile: false,
    });
    expect(r.result?.ssPH).toBeNull();
    expect(r.warnings.map((w) => w.code)).toContain("organic-beyond-data");
  });
});

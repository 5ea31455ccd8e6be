import { describe, expect, it } from "vitest";
import { assayNote, assayUsed, lotChemistry } from "../../../src/lib/preparation/lot-assays";
import { preparationPlan } from "../../../src/lib/preparation/plan";
import type { RecipeSpec } from "../../../src/lib/schemas/recipes";

// 25 mM KH2PO4 taken to pH 7.0 with KOH pellets, in water (common LC buffer recipe, invented demo).
const spec: RecipeSpec = {
  solvents: [{ reagent: "water", percent: 100 }],
  buffer: {
    reagents: ["potassium-dihydrogen-phosphate", "potassium-hydroxide"],
    targetPH: 7,
    concentration_mM: 25,
    basis: "first",
    temperature_C: 25,
  },
  additives: [],
  labile: false,
};
const target = (plan: ReturnType<typeof preparationPlan>, id: string) =>
  plan.components.find((c) => c.reagent === id)?.target ?? Number.NaN;

describe("the picked lot's assay sets what is weighed", () => {
  it("a KOH lot assaying 85 % weighs 1/0.85 of the pure mass; one with none uses the catalogue's typical 85 %", () => {
    const pure = preparationPlan({
      spec,
      volume_mL: 1000,
      ...lotChemistry([{ reagent: "potassium-hydroxide", assayPercent: 100, density_g_mL: null }]),
    });
    const lot85 = preparationPlan({
      spec,
      volume_mL: 1000,
      ...lotChemistry([{ reagent: "potassium-hydroxide", assayPercent: 85, density_g_mL: null }]),
    });
    const none = preparationPlan({
      spec,
      volume_mL: 1000,
      ...lotChemistry([{ reagent: "potassium-hydroxide", assayPercent: null, density_g_mL: null }]),
    });
    expect(target(lot85, "potassium-hydroxide") / target(pure, "potassium-hydroxide")).toBeCloseTo(1 / 0.85, 12);
    expect(target(none, "potassium-hydroxide")).toBeCloseTo(target(lot85, "potassium-hydroxide"), 12);
  });

  it("the first lot of each reagent counts, and lots without data add nothing", () => {
    expect(
      lotChemistry([
        { reagent: "phosphoric-acid", assayPercent: 86, density_g_mL: 1.7 },
        { reagent: "phosphoric-acid", assayPercent: 88, density_g_mL: null },
        undefined,
        { reagent: "formic-acid", assayPercent: null, density_g_mL: null },
      ]),
    ).toEqual({ purities: { "phosphoric-acid": 0.86 }, densities_g_mL: { "phosphoric-acid": 1.7 } });
  });

  it.each([
    [
      "potassium-hydroxide",
      "titrant",
      { reagent: "potassium-hydroxide", assayPercent: 86.1, density_g_mL: null },
      { percent: 86.1, source: "lot" },
      /lot's certificate/,
    ],
    [
      "potassium-hydroxide",
      "titrant",
      { reagent: "potassium-hydroxide", assayPercent: null, density_g_mL: null },
      { percent: 85, source: "typical" },
      /typical value/,
    ],
    [
      "ammonium-formate",
      "additive",
      { reagent: "ammonium-formate", assayPercent: null, density_g_mL: null },
      { percent: 100, source: "none" },
      /taken as 100 %/,
    ],
  ] as const)("%s (%s): %j", (reagent, role, lot, used, note) => {
    expect(assayUsed(reagent, role, lot)).toEqual(used);
    expect(assayNote(assayUsed(reagent, role, lot))).toMatch(note);
  });

  it("solvents have no assay: their volumes are of the product as sold", () => {
    expect(assayUsed("acetonitrile", "solvent", { reagent: "acetonitrile", assayPercent: 99.9, density_g_mL: null })).toBeNull();
  });

  it("the final volume no longer adds the buffer reagents, which are made up to the water's volume", () => {
    const withAcid: RecipeSpec = {
      ...spec,
      buffer: {
        reagents: ["potassium-dihydrogen-phosphate", "phosphoric-acid"],
        targetPH: 2.5,
        concentration_mM: 20,
        basis: "first",
        temperature_C: 25,
      },
    };
    expect(preparationPlan({ spec: withAcid, volume_mL: 1000 }).finalVolume_mL).toBeCloseTo(1000, 9);
  });
});

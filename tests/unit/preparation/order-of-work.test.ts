import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { reagents } from "../../../src/lib/chem/reagents";
import { DEMO_RECIPE_SPECS } from "../../../src/db/demo-recipes";
import { preparationPlan } from "../../../src/lib/preparation/plan";
import { recipeSpecSchema } from "../../../src/lib/schemas/recipes";

const demo = Object.entries(DEMO_RECIPE_SPECS).map(([code, raw]) => [code, recipeSpecSchema.parse(raw)] as const);
const plan = (code: keyof typeof DEMO_RECIPE_SPECS, volume_mL = 1000) =>
  preparationPlan({ spec: recipeSpecSchema.parse(DEMO_RECIPE_SPECS[code]), volume_mL });

/** Catalogue names a text mentions, "water" included. */
function namedReagents(text: string): string[] {
  const t = text.toLowerCase();
  return reagents
    .filter((r) => new RegExp(`\\b${r.name.toLowerCase().replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}\\b`).test(t))
    .map((r) => r.id);
}

describe("order of work (generated from the components present)", () => {
  it("names only components the recipe has, for every demo recipe and any batch volume", () => {
    fc.assert(
      fc.property(fc.constantFrom(...demo), fc.integer({ min: 50, max: 20_000 }), ([, spec], volume_mL) => {
        const p = preparationPlan({ spec, volume_mL });
        const present = new Set(p.components.map((c) => c.reagent));
        for (const text of [...p.steps, ...p.cautions, ...p.warnings.map((w) => w.message)])
          for (const id of namedReagents(text)) expect(present.has(id), `"${text}" names ${id}`).toBe(true);
      }),
      { numRuns: 200 },
    );
  });

  it("adds formic acid to acetonitrile, not to water, in the neat organic recipe", () => {
    const p = plan("MP-FA-ACN");
    const all = [...p.steps, ...p.cautions, ...p.warnings.map((w) => w.message)].join(" ");
    expect(all).not.toMatch(/water/i);
    expect(p.steps.join(" ")).toMatch(/of formic acid to the acetonitrile/);
    // Organic first: it is measured before the additive goes into it.
    expect(p.steps.findIndex((s) => /acetonitrile in a graduated cylinder/.test(s))).toBeLessThan(
      p.steps.findIndex((s) => /of formic acid/.test(s)),
    );
  });

  it("makes the final volume the batch volume (0.1 % v/v of 1000 mL is 1.000 mL, by the definition of % v/v)", () => {
    for (const [code] of demo) expect(plan(code as keyof typeof DEMO_RECIPE_SPECS).finalVolume_mL).toBeCloseTo(1000, 6);
    const acn = plan("MP-FA-ACN");
    expect(acn.components.find((c) => c.reagent === "formic-acid")!.target).toBeCloseTo(1.0, 6);
    expect(acn.components.find((c) => c.reagent === "acetonitrile")!.target).toBeCloseTo(999.0, 6);
  });

  it("puts acid into water, and sets the buffer before making up to volume, where there is water", () => {
    const water = plan("MP-FA-W");
    expect(water.steps[0]).toMatch(/water/);
    expect(water.steps.join(" ")).toMatch(/formic acid to the water/);
    const phos = plan("MP-PHOS-30");
    const at = (re: RegExp) => phos.steps.findIndex((s) => re.test(s));
    expect(at(/dissolve/)).toBeGreaterThanOrEqual(0);
    expect(at(/dissolve/)).toBeLessThan(at(/titrant, phosphoric acid/));
    expect(at(/titrant/)).toBeLessThan(at(/Make up to/));
    expect(phos.cautions.join(" ")).toMatch(/never water to it/);
  });

  it("adds the organic last, to the aqueous part, in a mixed recipe", () => {
    const spec = recipeSpecSchema.parse({
      solvents: [
        { reagent: "water", percent: 70 },
        { reagent: "acetonitrile", percent: 30 },
      ],
      additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" }],
    });
    const p = preparationPlan({ spec, volume_mL: 2000 });
    const last = p.steps.findIndex((s) => /Add the acetonitrile to the aqueous part/.test(s));
    expect(last).toBeGreaterThan(p.steps.findIndex((s) => /formic acid to the water/.test(s)));
    expect(p.finalVolume_mL).toBeCloseTo(2000, 6);
  });
});

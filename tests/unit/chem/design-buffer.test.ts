import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ChemInputError, designBuffer, getReagent, reagentDensity, solutionPH } from "../../../src/lib/chem";
import type { DesignBufferInput } from "../../../src/lib/chem";

const roundTrip = (input: DesignBufferInput) => {
  const r = designBuffer(input);
  const V_L = input.volume_mL / 1000;
  const back = solutionPH({
    components: r.components.map((c) => ({ reagent: c.reagent, concentration_mol_L: c.amount_mol / V_L })),
    temperature_C: input.temperature_C ?? 25,
  });
  return { r, back };
};

describe("designBuffer round trips through solutionPH within 0.005", () => {
  // Recipes of common LC buffers (common practice).
  it.each<[string, DesignBufferInput]>([
    [
      "10 mM ammonium formate to pH 3.5 with formic acid",
      { targetPH: 3.5, volume_mL: 1000, reagents: ["ammonium-formate", "formic-acid"], concentration_mM: 10, basis: "first" },
    ],
    [
      "10 mM ammonium acetate to pH 4.8 with acetic acid",
      { targetPH: 4.8, volume_mL: 1000, reagents: ["ammonium-acetate", "acetic-acid"], concentration_mM: 10, basis: "first" },
    ],
    [
      "10 mM ammonium bicarbonate to pH 10 with ammonia",
      { targetPH: 10, volume_mL: 500, reagents: ["ammonium-bicarbonate", "ammonia-solution"], concentration_mM: 10, basis: "first" },
    ],
    [
      "25 mM phosphate pH 7.0 from KH2PO4/K2HPO4",
      {
        targetPH: 7.0,
        volume_mL: 1000,
        reagents: ["potassium-dihydrogen-phosphate", "dipotassium-hydrogen-phosphate"],
        concentration_mM: 25,
        basis: "total",
      },
    ],
    [
      "20 mM KH2PO4 to pH 2.5 with phosphoric acid",
      {
        targetPH: 2.5,
        volume_mL: 1000,
        reagents: ["potassium-dihydrogen-phosphate", "phosphoric-acid"],
        concentration_mM: 20,
        basis: "first",
      },
    ],
    [
      "50 mM Tris to pH 8.1 with HCl at 20 °C",
      { targetPH: 8.1, volume_mL: 500, reagents: ["tris", "hydrochloric-acid"], concentration_mM: 50, basis: "first", temperature_C: 20 },
    ],
    [
      "20 mM citrate pH 4 from citric acid/trisodium citrate",
      {
        targetPH: 4.0,
        volume_mL: 1000,
        reagents: ["citric-acid-monohydrate", "trisodium-citrate-dihydrate"],
        concentration_mM: 20,
        basis: "total",
      },
    ],
    [
      "50 mM acetate pH 4.76 from acetic acid/sodium acetate",
      { targetPH: 4.76, volume_mL: 1000, reagents: ["acetic-acid", "sodium-acetate-trihydrate"], concentration_mM: 50, basis: "total" },
    ],
    [
      "10 mM phosphate pH 6.8 from NaH2PO4·2H2O/Na2HPO4·12H2O at 37 °C",
      {
        targetPH: 6.8,
        volume_mL: 250,
        reagents: ["sodium-dihydrogen-phosphate-dihydrate", "disodium-hydrogen-phosphate-dodecahydrate"],
        concentration_mM: 10,
        basis: "total",
        temperature_C: 37,
      },
    ],
    [
      "20 mM sodium acetate to pH 5 with acetic acid",
      { targetPH: 5, volume_mL: 1000, reagents: ["sodium-acetate", "acetic-acid"], concentration_mM: 20, basis: "first" },
    ],
    [
      "25 mM KH2PO4 to pH 7 with KOH",
      {
        targetPH: 7,
        volume_mL: 1000,
        reagents: ["potassium-dihydrogen-phosphate", "potassium-hydroxide"],
        concentration_mM: 25,
        basis: "first",
      },
    ],
  ])("%s", (_name, input) => {
    const { r, back } = roundTrip(input);
    expect(Math.abs(back.pH - input.targetPH)).toBeLessThan(0.005);
    expect(Math.abs(r.pH - input.targetPH)).toBeLessThan(0.005);
  });

  it("holds for random targets between the pKa values (fast-check)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 5.5, max: 8.5, noNaN: true }),
        fc.double({ min: 1, max: 100, noNaN: true }),
        fc.double({ min: 5, max: 35, noNaN: true }),
        (pH, mM, t) => {
          const { back } = roundTrip({
            targetPH: pH,
            volume_mL: 1000,
            reagents: ["sodium-dihydrogen-phosphate", "disodium-hydrogen-phosphate"],
            concentration_mM: mM,
            basis: "total",
            temperature_C: t,
          });
          expect(Math.abs(back.pH - pH)).toBeLessThan(0.005);
        },
      ),
      { numRuns: 150 },
    );
  });
});

describe("amounts", () => {
  it("basis 'total' splits the system total; basis 'first' holds the first reagent", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 6.2, max: 8.2, noNaN: true }),
        fc.double({ min: 1, max: 50, noNaN: true }),
        fc.double({ min: 10, max: 2000, noNaN: true }),
        (pH, mM, V) => {
          const tot = designBuffer({
            targetPH: pH,
            volume_mL: V,
            reagents: ["potassium-dihydrogen-phosphate", "dipotassium-hydrogen-phosphate"],
            concentration_mM: mM,
            basis: "total",
          });
          const sum = tot.components.reduce((a, c) => a + c.amount_mol, 0);
          expect(sum).toBeCloseTo((mM / 1000) * (V / 1000), 12);
          const first = designBuffer({
            targetPH: pH,
            volume_mL: V,
            reagents: ["potassium-dihydrogen-phosphate", "sodium-hydroxide"],
            concentration_mM: mM,
            basis: "first",
          });
          expect(first.components[0]?.amount_mol).toBeCloseTo((mM / 1000) * (V / 1000), 12);
        },
      ),
      { numRuns: 100 },
    );
  });

  it("gives solids as mass (molar mass of the hydrate) and liquids as volume (density and purity)", () => {
    const r = designBuffer({
      targetPH: 2.5,
      volume_mL: 1000,
      reagents: ["potassium-dihydrogen-phosphate", "phosphoric-acid"],
      concentration_mM: 20,
      basis: "first",
    });
    const [salt, acid] = r.components;
    const kh2po4 = getReagent("potassium-dihydrogen-phosphate");
    const h3po4 = getReagent("phosphoric-acid");
    if (salt === undefined || acid === undefined || kh2po4 === undefined || h3po4 === undefined) throw new Error("missing");
    // 20 mmol KH2PO4 × 136.084 g/mol = 2.7217 g (hand calculation)
    expect(salt.mass_g).toBeCloseTo(0.02 * 136.084, 3);
    expect(salt.volume_mL).toBeUndefined();
    expect(acid.mass_g).toBeUndefined();
    const density = reagentDensity(h3po4, 25) ?? Number.NaN;
    expect(acid.volume_mL).toBeCloseTo((acid.amount_mol * h3po4.molarMass_g_mol) / 0.85 / density, 9);
  });

  it("pH rises monotonically with more base in the design (fast-check)", () => {
    fc.assert(
      fc.property(fc.double({ min: 3.9, max: 5.6, noNaN: true }), fc.double({ min: 0.01, max: 0.5, noNaN: true }), (pH, step) => {
        const a = designBuffer({
          targetPH: pH,
          volume_mL: 1000,
          reagents: ["acetic-acid", "sodium-hydroxide"],
          concentration_mM: 50,
          basis: "first",
        });
        const b = designBuffer({
          targetPH: Math.min(pH + step, 5.7),
          volume_mL: 1000,
          reagents: ["acetic-acid", "sodium-hydroxide"],
          concentration_mM: 50,
          basis: "first",
        });
        expect(b.components[1]?.amount_mol ?? 0).toBeGreaterThanOrEqual((a.components[1]?.amount_mol ?? 0) - 1e-15);
      }),
      { numRuns: 100 },
    );
  });
});

describe("the lot's assay (purities)", () => {
  const koh = (purities?: Record<string, number>) =>
    designBuffer({
      targetPH: 7.0,
      volume_mL: 1000,
      reagents: ["potassium-dihydrogen-phosphate", "potassium-hydroxide"],
      concentration_mM: 25,
      basis: "first",
      ...(purities ? { purities } : {}),
    });
  const mass = (r: ReturnType<typeof koh>, id: string) => r.components.find((c) => c.reagent === id)?.mass_g ?? Number.NaN;

  it("weighs 1/0.85 of the pure mass of KOH for an 85 % lot (the review's case: pellets are about 85 % KOH)", () => {
    const pure = koh({ "potassium-hydroxide": 1 });
    const lot = koh({ "potassium-hydroxide": 0.85 });
    expect(mass(lot, "potassium-hydroxide") / mass(pure, "potassium-hydroxide")).toBeCloseTo(1 / 0.85, 12);
    // The amount of KOH, and so the pH, is unchanged: only what is weighed follows the assay.
    expect(lot.components[1]?.amount_mol).toBeCloseTo(pure.components[1]?.amount_mol ?? 0, 15);
    expect(lot.pH).toBeCloseTo(pure.pH, 12);
    // The other reagent keeps its own (typical) assay.
    expect(mass(lot, "potassium-dihydrogen-phosphate")).toBeCloseTo(mass(pure, "potassium-dihydrogen-phosphate"), 12);
  });

  it("uses the catalogue's typical assay when the lot has none (KOH 85 %, common practice)", () => {
    expect(mass(koh(), "potassium-hydroxide")).toBeCloseTo(mass(koh({ "potassium-hydroxide": 0.85 }), "potassium-hydroxide"), 12);
  });

  it("measures less of an 88 % phosphoric acid than of the 85 % product, and warns that the 85 % density was used", () => {
    const acid = (purities?: Record<string, number>, densities_g_mL?: Record<string, number>) =>
      designBuffer({
        targetPH: 2.5,
        volume_mL: 1000,
        reagents: ["potassium-dihydrogen-phosphate", "phosphoric-acid"],
        concentration_mM: 20,
        basis: "first",
        ...(purities ? { purities } : {}),
        ...(densities_g_mL ? { densities_g_mL } : {}),
      });
    const v = (r: ReturnType<typeof acid>) => r.components[1]?.volume_mL ?? Number.NaN;
    const typical = acid();
    const lot = acid({ "phosphoric-acid": 0.88 });
    expect(v(lot) / v(typical)).toBeCloseTo(0.85 / 0.88, 12);
    expect(lot.warnings.map((w) => w.code)).toContain("lot-density-assumed");
    expect(typical.warnings.map((w) => w.code)).not.toContain("lot-density-assumed");
    // With the lot's density (illustrative 1.71 g/mL at 20 °C) the mass of product is exactly n·M/assay.
    const dense = acid({ "phosphoric-acid": 0.88 }, { "phosphoric-acid": 1.71 });
    const n = dense.components[1]?.amount_mol ?? 0;
    const rho25 = (1.71 * 1.685) / 1.69; // carried from 20 to 25 °C with the catalogue's slope
    expect(v(dense) * rho25).toBeCloseTo((n * 97.994) / 0.88, 3);
  });

  it.each([[{ "potassium-hydroxide": 0 }], [{ "potassium-hydroxide": 1.01 }], [{ "potassium-hydroxide": -0.5 }]])(
    "refuses the assay %j, naming the field",
    (purities) => {
      expect(() => koh(purities)).toThrow(ChemInputError);
      try {
        koh(purities);
      } catch (e) {
        expect((e as ChemInputError).field).toBe("purities.potassium-hydroxide");
      }
    },
  );
});

describe("warnings and errors", () => {
  const codes = (input: DesignBufferInput) => designBuffer(input).warnings.map((w) => w.code);

  it("warns when the target is more than 1 pH unit from every pKa", () => {
    expect(
      codes({
        targetPH: 9,
        volume_mL: 1000,
        reagents: ["potassium-dihydrogen-phosphate", "dipotassium-hydrogen-phosphate"],
        concentration_mM: 25,
        basis: "total",
      }),
    ).toContain("ph-far-from-pka");
    expect(
      codes({
        targetPH: 7,
        volume_mL: 1000,
        reagents: ["potassium-dihydrogen-phosphate", "dipotassium-hydrogen-phosphate"],
        concentration_mM: 25,
        basis: "total",
      }),
    ).not.toContain("ph-far-from-pka");
  });

  it("warns that phosphate is not MS-compatible, but not for ammonium formate/formic acid", () => {
    expect(
      codes({
        targetPH: 7,
        volume_mL: 1000,
        reagents: ["potassium-dihydrogen-phosphate", "dipotassium-hydrogen-phosphate"],
        concentration_mM: 25,
        basis: "total",
      }),
    ).toContain("non-volatile-buffer");
    expect(
      codes({ targetPH: 3.5, volume_mL: 1000, reagents: ["ammonium-formate", "formic-acid"], concentration_mM: 10, basis: "first" }),
    ).not.toContain("non-volatile-buffer");
  });

  it("tells the technician to add a concentrated acid to water and to follow the SOP", () => {
    const w = designBuffer({
      targetPH: 2.5,
      volume_mL: 1000,
      reagents: ["potassium-dihydrogen-phosphate", "phosphoric-acid"],
      concentration_mM: 20,
      basis: "first",
    }).warnings.find((x) => x.code === "concentrated-reagent");
    expect(w?.reagent).toBe("phosphoric-acid");
    expect(w?.message).toMatch(/never water to the acid/);
    expect(w?.message).toMatch(/SOP/);
  });

  it("warns about a UV cutoff above the detection wavelength", () => {
    expect(
      codes({
        targetPH: 4,
        volume_mL: 1000,
        reagents: ["citric-acid", "trisodium-citrate-dihydrate"],
        concentration_mM: 20,
        basis: "total",
        detectionWavelength_nm: 210,
      }),
    ).toContain("uv-cutoff");
    expect(
      codes({
        targetPH: 4,
        volume_mL: 1000,
        reagents: ["citric-acid", "trisodium-citrate-dihydrate"],
        concentration_mM: 20,
        basis: "total",
        detectionWavelength_nm: 254,
      }),
    ).not.toContain("uv-cutoff");
  });

  it.each<[string, DesignBufferInput, string]>([
    [
      "unreachable target",
      { targetPH: 9, volume_mL: 1000, reagents: ["ammonium-formate", "formic-acid"], concentration_mM: 10, basis: "first" },
      "target-unreachable",
    ],
    [
      "target outside the pair",
      {
        targetPH: 4,
        volume_mL: 1000,
        reagents: ["potassium-dihydrogen-phosphate", "dipotassium-hydrogen-phosphate"],
        concentration_mM: 25,
        basis: "total",
      },
      "target-unreachable",
    ],
    [
      "'total' without a shared system",
      { targetPH: 8, volume_mL: 1000, reagents: ["tris", "hydrochloric-acid"], concentration_mM: 25, basis: "total" },
      "no-shared-acid-system",
    ],
    [
      "unknown reagent",
      { targetPH: 7, volume_mL: 1000, reagents: ["tris", "unobtainium"], concentration_mM: 25, basis: "first" },
      "unknown-reagent",
    ],
    [
      "zero volume",
      { targetPH: 7, volume_mL: 0, reagents: ["tris", "hydrochloric-acid"], concentration_mM: 25, basis: "first" },
      "invalid-input",
    ],
    [
      "a solvent",
      { targetPH: 7, volume_mL: 100, reagents: ["methanol", "hydrochloric-acid"], concentration_mM: 25, basis: "first" },
      "not-aqueous-solute",
    ],
  ])("rejects %s", (_name, input, code) => {
    let caught: unknown;
    try {
      designBuffer(input);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(ChemInputError);
    expect((caught as ChemInputError).code).toBe(code);
    expect((caught as ChemInputError).message.length).toBeGreaterThan(10);
  });
});

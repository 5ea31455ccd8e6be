import { describe, expect, it } from "vitest";
import { batchCodeBase, nextBatchCode } from "../../../src/lib/preparation/batch-code";
import { DEFAULT_TOLERANCES, findDeviations } from "../../../src/lib/preparation/deviations";
import { batchExpiry, DEFAULT_EXPIRY_RULES, lotExpired, type MixtureKind } from "../../../src/lib/preparation/expiry";
import { mixtureKind } from "../../../src/lib/preparation/mixture-kind";
import { preparationPlan } from "../../../src/lib/preparation/plan";
import { mixMobilePhase } from "../../../src/lib/chem";
import type { RecipeSpec } from "../../../src/lib/schemas/recipes";

const spec = (s: Partial<RecipeSpec>): RecipeSpec => ({
  solvents: [{ reagent: "water", percent: 100 }],
  additives: [],
  labile: false,
  ...s,
});
const phosphate = {
  reagents: ["potassium-dihydrogen-phosphate", "phosphoric-acid"] as [string, string],
  targetPH: 3,
  concentration_mM: 25,
  basis: "first" as const,
  temperature_C: 25,
};

describe("mixtureKind (the row of the expiry table that applies)", () => {
  it.each<[string, RecipeSpec, MixtureKind]>([
    ["phosphate buffer in water", spec({ buffer: phosphate }), "aqueous-buffer"],
    [
      "0.1 % formic acid in water (no salt)",
      spec({ additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" }] }),
      "aqueous-acidified",
    ],
    [
      "ammonium formate as an additive (a salt)",
      spec({ additives: [{ reagent: "ammonium-formate", amount: 10, unit: "mM" }] }),
      "aqueous-buffer",
    ],
    [
      "water–acetonitrile 50:50",
      spec({
        solvents: [
          { reagent: "water", percent: 50 },
          { reagent: "acetonitrile", percent: 50 },
        ],
      }),
      "aqueous-organic",
    ],
    [
      "0.1 % formic acid in acetonitrile",
      spec({ solvents: [{ reagent: "acetonitrile", percent: 100 }], additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" }] }),
      "neat-organic",
    ],
    // Ammonium bicarbonate loses CO2 and ammonia: shortest rule, whatever else is in the bottle.
    ["ammonium bicarbonate", spec({ additives: [{ reagent: "ammonium-bicarbonate", amount: 10, unit: "mM" }] }), "labile-additive"],
    ["flagged labile by the recipe", spec({ solvents: [{ reagent: "methanol", percent: 100 }], labile: true }), "labile-additive"],
  ])("%s → %s", (_name, s, kind) => {
    expect(mixtureKind(s)).toBe(kind);
  });
});

describe("batchExpiry", () => {
  const preparedAt = new Date("2026-12-03T08:30:00Z");
  it.each<[MixtureKind, string]>([
    ["aqueous-buffer", "2026-12-05T08:30:00.000Z"], // 48 h, common practice
    ["aqueous-organic", "2026-12-10T08:30:00.000Z"], // 7 days
    ["neat-organic", "2027-01-02T08:30:00.000Z"], // 30 days
    ["labile-additive", "2026-12-04T08:30:00.000Z"], // 24 h
  ])("%s from the default rules → %s", (kind, expected) => {
    expect(batchExpiry({ kind, preparedAt, rules: DEFAULT_EXPIRY_RULES, lots: [] }).expiresAt.toISOString()).toBe(expected);
  });
  it("is cut short by a lot expiring earlier: the end of the lot's expiry day", () => {
    const e = batchExpiry({
      kind: "neat-organic",
      preparedAt,
      rules: DEFAULT_EXPIRY_RULES,
      lots: [
        { lotNumber: "AN-1", expiresOn: "2027-03-01" },
        { lotNumber: "FA-9", expiresOn: "2026-12-20" },
      ],
    });
    expect(e.expiresAt.toISOString()).toBe("2026-12-21T00:00:00.000Z");
    expect(e.limitedBy?.lotNumber).toBe("FA-9");
    expect(e.reason).toContain("FA-9");
  });
  it("follows the facility's own rule table", () => {
    const rules = DEFAULT_EXPIRY_RULES.map((r) => (r.kind === "aqueous-buffer" ? { ...r, shelfLife_h: 72 } : r));
    expect(batchExpiry({ kind: "aqueous-buffer", preparedAt, rules, lots: [] }).expiresAt.toISOString()).toBe("2026-12-06T08:30:00.000Z");
  });
  it("treats a lot as usable through its expiry day", () => {
    expect(lotExpired("2026-12-03", new Date("2026-12-03T23:59:59Z"))).toBe(false);
    expect(lotExpired("2026-12-03", new Date("2026-12-04T00:00:00Z"))).toBe(true);
  });
});

describe("findDeviations (defaults pH ±0.05, amounts ±2 %)", () => {
  const base = { tolerances: DEFAULT_TOLERANCES, targetPH: 3.0 };
  it.each<[string, number | null, number | null, string[]]>([
    ["on target", 3.02, 3.4, []],
    ["pH at the edge passes", 3.05, 3.4, []],
    ["pH beyond the edge", 3.06, 3.4, ["measuredPH"]],
    ["amount at +2 % passes", 3.0, 3.468, []],
    ["amount at +2.1 %", 3.0, 3.4714, ["components.0.actualAmount"]],
    ["amount short by 3 % and pH low", 2.9, 3.298, ["measuredPH", "components.0.actualAmount"]],
    ["nothing recorded, nothing flagged", null, null, []],
  ])("%s", (_name, pH, actual, fields) => {
    const found = findDeviations({ ...base, measuredPH: pH, components: [{ name: "KH2PO4", unit: "g", target: 3.4, actual }] });
    expect(found.map((d) => d.field)).toEqual(fields);
  });
});

describe("batch codes", () => {
  it("are B + year, month and day, with a running number from the second of the day", () => {
    const day = new Date("2026-12-03T10:00:00Z");
    expect(batchCodeBase(day)).toBe("B26-1203");
    expect(nextBatchCode("B26-1203", [])).toBe("B26-1203");
    expect(nextBatchCode("B26-1203", ["B26-1203"])).toBe("B26-1203-2");
    expect(nextBatchCode("B26-1203", ["B26-1203", "B26-1203-2", "B26-1203-4"])).toBe("B26-1203-3");
  });
});

describe("preparationPlan", () => {
  it("measures the solvents in the recipe's ratio and the additive per litre of the final mix (DESIGN: additives per litre)", () => {
    const s = spec({
      solvents: [
        { reagent: "water", percent: 70 },
        { reagent: "acetonitrile", percent: 30 },
      ],
      additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" }],
    });
    const plan = preparationPlan({ spec: s, volume_mL: 2000, temperature_C: 22 });
    const target = (id: string) => plan.components.find((c) => c.reagent === id)!.target;
    expect(target("acetonitrile") / target("water")).toBeCloseTo(30 / 70, 9);
    // 0.1 % v/v of a 2000 mL mix is 2.000 mL (definition of % v/v).
    expect(target("formic-acid")).toBeCloseTo(2, 9);
    expect(plan.finalVolume_mL).toBeCloseTo(2000, 6);
    // The measured solvents exceed 1998 mL by the contraction on mixing, which mixMobilePhase estimates.
    const mix = mixMobilePhase({ total_mL: target("water") + target("acetonitrile"), solvents: s.solvents, temperature_C: 22 });
    expect(mix.finalVolume_mL).toBeCloseTo(1998, 6);
    expect(plan.kind).toBe("aqueous-organic");
    expect(plan.steps.some((step) => /separately/.test(step))).toBe(true);
    expect(plan.cautions.some((c) => /SOPs/.test(c))).toBe(true);
  });
  it("scales the buffer salt with the aqueous part and warns of concentrated acid", () => {
    const one = preparationPlan({ spec: spec({ buffer: phosphate }), volume_mL: 1000 });
    const two = preparationPlan({ spec: spec({ buffer: phosphate }), volume_mL: 2000 });
    const salt = (p: typeof one) => p.components.find((c) => c.reagent === "potassium-dihydrogen-phosphate")!.target;
    // 25 mM KH2PO4 (136.086 g/mol, CIAAW) in 1 L: 3.402 g.
    expect(salt(one)).toBeCloseTo(3.402, 3);
    expect(salt(two)).toBeCloseTo(2 * salt(one), 9);
    expect(one.components.find((c) => c.reagent === "phosphoric-acid")!.role).toBe("titrant");
    // Handling the concentrated acid is a caution, said once, not also a warning about the mix.
    expect(one.warnings.map((w) => w.code)).not.toContain("concentrated-reagent");
    expect(one.cautions.join(" ")).toMatch(/Concentrated acid or base/);
    expect(one.steps.join(" ")).toMatch(/never water to the acid/);
  });
});

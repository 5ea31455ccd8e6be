import { describe, expect, it } from "vitest";
import { actualsProblems, DEFAULT_TOLERANCES, findDeviations } from "../../../src/lib/preparation/deviations";

const water = { name: "Water", unit: "mL", target: 999, role: "solvent" };
const titrant = { name: "Phosphoric acid 85 %", unit: "mL", target: 0.3, role: "titrant" };

describe("actuals: required, and refused when off by 10× or more", () => {
  it.each<[string, number | null, string | null]>([
    ["blank", null, 'Record the water actually used, or press "As planned"'],
    ["as planned", 999, null],
    ["a slip of a decimal point (99.9)", 99.9, "99.9 mL is 1/10 of the target 999 mL: check the unit and the decimal point"],
    ["litres typed as millilitres ×10", 9990, "9990 mL is 10× the target 999 mL: check the unit and the decimal point"],
    ["5 % short is a deviation, not a slip", 949, null],
  ])("%s", (_, actual, message) => {
    const problems = actualsProblems([{ ...water, actual }]);
    expect(problems).toEqual(message ? [{ field: "components.0.actualAmount", message }] : []);
  });

  it("requires the titrant too, but never refuses its amount: it is added until the pH reads right", () => {
    expect(actualsProblems([{ ...titrant, actual: null }])).toHaveLength(1);
    expect(actualsProblems([{ ...titrant, actual: 3 }])).toEqual([]);
  });
});

describe("the titrant is compared with its estimate, not held to ±2 %", () => {
  it("does not flag a titrant 40 % above the estimate", () => {
    expect(findDeviations({ tolerances: DEFAULT_TOLERANCES, components: [{ ...titrant, actual: 0.42 }] })).toEqual([]);
  });
  it("flags a titrant far from the estimate (a likely wrong reagent or concentration)", () => {
    const [flag] = findDeviations({ tolerances: DEFAULT_TOLERANCES, components: [{ ...titrant, actual: 1.2 }] });
    expect(flag?.message).toMatch(/far from the estimate 0\.300 mL; check the reagent and its concentration/);
  });
  it("still holds a weighed buffer salt to the tolerance", () => {
    const salt = { name: "Potassium dihydrogen phosphate", unit: "g", target: 3.402, role: "buffer", actual: 3.6 };
    expect(findDeviations({ tolerances: DEFAULT_TOLERANCES, components: [salt] })).toHaveLength(1);
  });
});

import { describe, expect, it } from "vitest";
import {
  ChemInputError,
  fitLSS,
  gradientRetention,
  mixMobilePhase,
  mixtureProperties,
  predictRetention,
  SOURCES,
  solventUse,
} from "../../../src/lib/chem";

/** The ChemInputError's field, or "accepted" when nothing was thrown. */
function refusedField(run: () => unknown): string {
  try {
    run();
  } catch (e) {
    if (e instanceof ChemInputError) return e.field ?? "(no field)";
    throw e;
  }
  return "accepted";
}

describe("%B outside 0–100 is refused, with the field named", () => {
  const lss = { logKw: 3, S: 4, deadTime_min: 1 };
  it.each([
    ["predictRetention at 120 %B", () => predictRetention({ ...lss, percentB: 120 }), "percentB"],
    ["predictRetention at −5 %B", () => predictRetention({ ...lss, percentB: -5 }), "percentB"],
    [
      "a gradient to 130 %B",
      () => gradientRetention({ ...lss, dwell_min: 1, gradient: { from_percentB: 5, to_percentB: 130, time_min: 10 } }),
      "gradient.to_percentB",
    ],
    [
      "a gradient from 101 %B",
      () => gradientRetention({ ...lss, dwell_min: 1, gradient: { from_percentB: 101, to_percentB: 100, time_min: 10 } }),
      "gradient.from_percentB",
    ],
    [
      "a scouting run at 150 %B",
      () =>
        fitLSS({
          deadTime_min: 1,
          runs: [
            { percentB: 150, retention_min: 3 },
            { percentB: 50, retention_min: 5 },
          ],
        }),
      "runs[0].percentB",
    ],
    [
      "a program point with a channel at 150 %",
      () =>
        solventUse({
          program: [
            { time_min: 0, flow_mL_min: 1, composition: { A: 150, B: -50 } },
            { time_min: 1, flow_mL_min: 1, composition: { A: 50, B: 50 } },
          ],
        }),
      "program[0].composition.A",
    ],
    [
      "a solvent at 120 % in a mix",
      () =>
        mixMobilePhase({
          total_mL: 100,
          solvents: [
            { reagent: "water", percent: 120 },
            { reagent: "acetonitrile", percent: -20 },
          ],
        }),
      "solvents[0].percent",
    ],
    [
      "a solvent at 110 % for the mix properties",
      () =>
        mixtureProperties({
          solvents: [
            { reagent: "water", percent: 110 },
            { reagent: "methanol", percent: -10 },
          ],
        }),
      "solvents[0].percent",
    ],
  ])("%s", (_name, run, field) => {
    expect(refusedField(run)).toBe(field);
  });
});

describe("sources: every value marked M says why it is still unchecked", () => {
  it.each(Object.entries(SOURCES).map(([key, s]) => [key, s] as const))("%s", (_key, s) => {
    if (s.confidence === "M") {
      expect("unchecked" in s && typeof s.unchecked === "string" && s.unchecked.length > 20).toBe(true);
    } else {
      expect(s.citation.length).toBeGreaterThan(10);
    }
  });
});

import fc from "fast-check";
import { evaluate, type Unit, unit } from "mathjs";
import { describe, expect, it } from "vitest";
import {
  celsiusToKelvin,
  G_PER_MG,
  lToML,
  mgToG,
  ML_PER_L,
  mLToL,
  mMToMolar,
  molarToMM,
  ZERO_CELSIUS_K,
} from "../../../src/lib/chem/units";

// convert-units does the work; mathjs is the second opinion.
describe("unit conversions agree with mathjs", () => {
  it.each([0, 0.001, 1, 250, 1e6])("%s mL to L and back", (x) => {
    expect(mLToL(x)).toBeCloseTo(unit(x, "mL").toNumber("L"), 12);
    expect(lToML(x)).toBeCloseTo(unit(x, "L").toNumber("mL"), 6);
  });

  it.each([0, 1, 12.5, 1000])("%s mg to g", (x) => {
    expect(mgToG(x)).toBeCloseTo(unit(x, "mg").toNumber("g"), 12);
  });

  it.each([0, 20, 25, 37, -10])("%s °C to K", (t) => {
    expect(celsiusToKelvin(t)).toBeCloseTo(unit(t, "degC").toNumber("K"), 10);
  });

  it("module-level factors", () => {
    expect(ZERO_CELSIUS_K).toBe(273.15);
    expect(ML_PER_L).toBeCloseTo(unit(1, "L").toNumber("mL"), 9);
    expect(G_PER_MG).toBeCloseTo(unit(1, "mg").toNumber("g"), 15);
  });

  it("mM and mol/L", () => {
    expect(mMToMolar(25)).toBeCloseTo(unit(25, "mmol").toNumber("mol"), 12);
    expect(molarToMM(0.025)).toBeCloseTo(25, 12);
  });

  it("mM ↔ mol/L as concentrations, not just amounts (mathjs compound units)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e4, noNaN: true }), (c_mM) => {
        const mathjs_mol_L = unit(c_mM, "mmol/L").toNumber("mol/L");
        expect(mMToMolar(c_mM)).toBeCloseTo(mathjs_mol_L, 12);
        expect(molarToMM(mathjs_mol_L)).toBeCloseTo(c_mM, 8);
      }),
    );
  });

  it("volume and mass conversions agree with mathjs and invert each other over the working range", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e6, noNaN: true }), (x) => {
        expect(mLToL(x)).toBeCloseTo(unit(x, "mL").toNumber("L"), 9);
        expect(lToML(mLToL(x))).toBeCloseTo(x, 6);
        expect(mgToG(x)).toBeCloseTo(unit(x, "mg").toNumber("g"), 9);
      }),
    );
  });

  it("°C to K agrees with mathjs over the library’s 0–50 °C range and beyond", () => {
    fc.assert(
      fc.property(fc.double({ min: -50, max: 150, noNaN: true }), (t) => {
        expect(celsiusToKelvin(t)).toBeCloseTo(unit(t, "degC").toNumber("K"), 9);
      }),
    );
  });
});

describe("physical constants used beside the conversions (mathjs, CODATA 2018)", () => {
  const constant = (name: string, units: string): number => (evaluate(name) as Unit).toNumber(units);

  it("R = N_A·k_B, the value the van 't Hoff correction uses", () => {
    expect(constant("avogadro", "mol^-1") * constant("boltzmann", "J/K")).toBeCloseTo(constant("gasConstant", "J / (K mol)"), 9);
  });

  it("R·ln 10 at 298.15 K (the dpKa/dT denominator) is 5.708 kJ/mol", () => {
    // 8.314462618 × 298.15 × ln 10 = 5708.0 J/mol (hand calculation from the CODATA exact R)
    expect((constant("gasConstant", "J / (K mol)") * 298.15 * Math.LN10) / 1000).toBeCloseTo(5.708, 3);
  });
});

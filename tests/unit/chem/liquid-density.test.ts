import { describe, expect, it } from "vitest";
import { ChemInputError, getReagent, mixMobilePhase, reagentDensity } from "../../../src/lib/chem";
import { dippr105_mol_m3, PERRY_105 } from "../../../src/lib/chem/liquid-density";

const rho = (id: string, t: number) => {
  const r = getReagent(id);
  if (r === undefined) throw new Error(id);
  return reagentDensity(r, t) ?? Number.NaN;
};

describe("Perry's DIPPR 105 correlation on its own against handbook densities (g/mL)", () => {
  // ρ = C1/C2^(1+(1−T/C3)^C4) mol/m³ × M: the correlation alone, before the catalogue anchors it.
  const raw = (id: string, t: number) => {
    const c = PERRY_105[id];
    const r = getReagent(id);
    if (c === undefined || r === undefined) throw new Error(id);
    return (dippr105_mol_m3(c, t + 273.15) * r.molarMass_g_mol) / 1e6;
  };
  it.each([
    // [id, °C, handbook value, tolerance]
    ["acetonitrile", 25, 0.7768, 0.0005], // ThermoML record, J. Chem. Thermodyn. doi:10.1016/j.jct.2006.01.015 (C)
    ["acetonitrile", 20, 0.7821, 0.0005], // same record (C)
    ["methanol", 25, 0.7866, 0.004], // Merck Index (C): the correlation is 0.4 % high, hence the anchor
    ["ethanol", 20, 0.7893, 0.002], // CRC concentrative properties, 100 % row (C)
    ["isopropanol", 20, 0.7848, 0.003], // CRC concentrative properties, 100 % row (C)
    ["tetrahydrofuran", 20, 0.8892, 0.005], // Merck Index (C)
    ["formic-acid", 20, 1.22, 0.002], // Merck Index 1.220 (from memory)
    ["acetic-acid", 20, 1.0477, 0.002], // CRC concentrative properties, 100 % row (C)
  ])("%s at %s °C is about %s", (id, t, value, tol) => {
    expect(Math.abs(raw(id, t) - value)).toBeLessThanOrEqual(tol);
  });
});

describe("densities change with temperature (no longer held flat outside 20–25 °C)", () => {
  it.each(["acetonitrile", "methanol", "ethanol", "isopropanol", "tetrahydrofuran", "formic-acid", "acetic-acid"])(
    "%s loses about 0.1 %/K (0.08–0.15 %/K between 15 and 35 °C)",
    (id) => {
      const lo = id === "acetic-acid" ? 17 : 15;
      const perK = (rho(id, 35) / rho(id, lo) - 1) / (35 - lo);
      expect(perK).toBeLessThan(-0.0008);
      expect(perK).toBeGreaterThan(-0.0015);
    },
  );

  it("acetonitrile at 30 °C: 0.7713 g/mL (ThermoML 298.15 K value carried with Perry's slope; a solvent data page gives 0.771, from memory)", () => {
    expect(rho("acetonitrile", 30)).toBeCloseTo(0.7713, 3);
  });

  it("methanol at 15 °C is denser than at 20 °C by the correlation's slope, not held at the 20 °C value", () => {
    expect(rho("methanol", 15)).toBeGreaterThan(rho("methanol", 20) + 0.004);
  });

  it("ethanol at 25 °C: 0.7849 (check-values §4, from memory) from the CRC 20 °C value and Perry's slope", () => {
    expect(rho("ethanol", 25)).toBeCloseTo(0.7849, 3);
  });

  it("glacial acetic acid at 25 °C: 1.0446 (from memory) against the CRC 20 °C value carried with Perry's slope", () => {
    expect(Math.abs(rho("acetic-acid", 25) - 1.0446)).toBeLessThanOrEqual(0.003);
  });
});

describe("temperatures outside the liquid range are refused with the field named", () => {
  it("glacial acetic acid freezes at 16.7 °C: a mix with it at 15 °C is refused (temperature_C)", () => {
    const mix = (t: number) =>
      mixMobilePhase({
        total_mL: 1000,
        temperature_C: t,
        solvents: [{ reagent: "water", percent: 100 }],
        additives: [{ reagent: "acetic-acid", amount: 1, unit: "%v/v" }],
      });
    expect(() => mix(15)).toThrow(ChemInputError);
    try {
      mix(15);
    } catch (e) {
      expect((e as ChemInputError).field).toBe("temperature_C");
      expect((e as Error).message).toMatch(/freezes at 16\.7 °C/);
    }
    expect(mix(20).components.find((c) => c.reagent === "acetic-acid")?.volume_mL).toBeGreaterThan(0);
  });

  it.each([-1, 51])("a mix at %s °C is refused (0–50 °C)", (t) => {
    expect(() => mixMobilePhase({ total_mL: 100, temperature_C: t, solvents: [{ reagent: "water", percent: 100 }] })).toThrow(
      /temperature_C must be between 0 and 50/,
    );
  });
});

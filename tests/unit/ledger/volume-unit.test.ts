import { describe, expect, it } from "vitest";
import { formatVolumeIn, volumeUnitFor } from "../../../src/lib/ledger/volume-unit";

describe("one volume unit per column", () => {
  it("keeps a column in mL while every figure is below a litre", () => {
    expect(volumeUnitFor([7.3, 950, 999.9])).toBe("mL");
    expect([7.3, 950].map((v) => formatVolumeIn(v, "mL"))).toEqual(["7.3 mL", "950.0 mL"]);
  });

  it("puts the whole column in L once one figure reaches a litre, small figures included", () => {
    expect(volumeUnitFor([714, 7_300])).toBe("L");
    expect([714, 7_300, 12_345.6].map((v) => formatVolumeIn(v, "L"))).toEqual(["0.71 L", "7.30 L", "12.35 L"]);
  });

  it("rounds to a sensible precision instead of printing the ledger's four decimals", () => {
    expect(formatVolumeIn(30.3896, "mL")).toBe("30.4 mL");
  });
});

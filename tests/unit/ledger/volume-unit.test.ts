import { describe, expect, it } from "vitest";
import { formatVolumeIn, volumeUnitFor } from "../../../src/lib/ledger/volume-unit";

describe("one volume unit per column", () => {
  it("keeps a column in mL while every figure is below 10 L", () => {
    expect(volumeUnitFor([7.3, 950, 9_999])).toBe("mL");
    expect([7.3, 950].map((v) => formatVolumeIn(v, "mL"))).toEqual(["7.3 mL", "950 mL"]);
  });

  it("puts the whole column in L once one figure reaches 10 L, small figures included", () => {
    expect(volumeUnitFor([7.3, 12_345.6])).toBe("L");
    expect([7.3, 12_345.6].map((v) => formatVolumeIn(v, "L"))).toEqual(["0.01 L", "12.35 L"]);
  });

  it("rounds to a sensible precision instead of printing the ledger's four decimals", () => {
    expect(formatVolumeIn(30.3896, "mL")).toBe("30.4 mL");
  });
});

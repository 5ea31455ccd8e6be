// Invoice numbers and tax per line, pure.
import { describe, expect, it } from "vitest";
import { invoiceLines, invoiceNumber, invoiceTax, taxOnAmount } from "../../../src/lib/billing/invoice";
import type { StatementLine } from "../../../src/lib/billing/statement";

const line = (amount_minor: number): StatementLine => ({
  projectCode: "QFT-IMP-001",
  projectName: "Impurity profiling",
  kind: "reagent",
  reagentId: "acetonitrile",
  description: "Acetonitrile, grade HPLC",
  quantity: "1000",
  quantityUnit: "mL",
  rateId: 1,
  unitPrice_minor: amount_minor,
  rateUnit: "L",
  rateEffectiveFrom: "2026-01-01",
  amount_minor,
});

describe("invoice numbers", () => {
  it("are the facility's prefix, the year and a five-digit sequence", () => {
    expect(invoiceNumber("VSC", 2026, 42)).toBe("VSC-2026-00042");
  });
});

describe("tax per line", () => {
  // Arithmetic checks (percent of an amount, half away from zero to the cent; common VAT practice, from memory).
  it.each([
    [7900, 21, 1659], // 79.00 × 21 % = 16.59
    [250, 21, 53], // 52.5 → 53
    [-250, 21, -53], // a credit rounds symmetrically
    [1000, 7.5, 75],
    [333, 19, 63], // 63.27 → 63
    [1000, 0, 0],
  ])("%i at %d %% is %i", (amount, percent, tax) => expect(taxOnAmount(amount, percent)).toBe(tax));

  it("totals are the sums of the rounded lines; zero lines are left out", () => {
    const result = invoiceLines([line(250), line(250), line(0)], invoiceTax("standard", 21, "VAT"));
    expect(result.lines).toHaveLength(2);
    expect(result).toMatchObject({ subtotal_minor: 500, tax_minor: 106, total_minor: 606 });
  });

  it("zero-rated and reverse-charge invoices carry 0 % with their legend; internal ones no tax at all", () => {
    expect(invoiceTax("reverse_charge", 21, "VAT")).toMatchObject({ percent: "0", legend: expect.stringContaining("Reverse charge") });
    expect(invoiceTax("zero_rated", null, null)).toMatchObject({
      percent: "0",
      label: "VAT",
      legend: expect.stringContaining("Zero-rated"),
    });
    expect(invoiceTax("none", null, null)).toMatchObject({ percent: null, legend: null });
  });
});

import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { addMoney, formatMoney } from "../../../src/lib/billing/money";
import { costLines, exactCost, rateInForce, roundMinor, toMicro, type Rate } from "../../../src/lib/billing/rates";

describe("formatMoney", () => {
  it.each([
    // [amount in minor units, currency, expected text] — worked by hand from the currencies' minor units
    [123456, "EUR", "€1,234.56"],
    [5, "EUR", "€0.05"],
    [-250, "EUR", "-€2.50"],
    [0, "EUR", "€0.00"],
    [1500, "JPY", "JP¥1,500"], // JPY has no minor unit: 1500 minor units are 1,500 yen (en-GB writes JP¥)
    [100000, "GBP", "£1,000.00"],
  ])("%i %s → %s", (amount, currency, text) => {
    expect(formatMoney({ amount, currency })).toBe(text);
  });

  it("refuses a fractional amount of minor units", () => {
    expect(() => formatMoney({ amount: 12.5, currency: "EUR" })).toThrow(/integer minor units/);
  });

  it("adds amounts of one currency and refuses to mix currencies", () => {
    expect(addMoney({ amount: 120, currency: "EUR" }, { amount: 5, currency: "EUR" })).toEqual({ amount: 125, currency: "EUR" });
    expect(() => addMoney({ amount: 1, currency: "EUR" }, { amount: 1, currency: "GBP" })).toThrow(/Cannot add/);
  });
});

const rate = (id: number, effectiveFrom: string, amount_minor: number, extra: Partial<Rate> = {}): Rate => ({
  id,
  kind: "reagent",
  reagentId: "acetonitrile",
  grade: null,
  priceList: "internal",
  unit: "L",
  amount_minor,
  currency: "EUR",
  effectiveFrom,
  ...extra,
});

describe("rateInForce", () => {
  const rates = [
    rate(1, "2026-01-01", 4200),
    rate(2, "2026-06-01", 4800),
    rate(3, "2026-06-01", 4500), // entered later on the same day: it replaces rate 2
    rate(4, "2026-01-01", 7900, { priceList: "external" }),
    rate(5, "2026-01-01", 1900, { reagentId: "methanol" }),
    rate(6, "2025-01-01", 3000, { grade: "LC-MS" }), // grade-specific: not the general rate
  ];
  it.each([
    ["2025-12-31T23:59:59Z", "internal", "acetonitrile", null], // before any general rate
    ["2026-01-01T00:00:00Z", "internal", "acetonitrile", 1],
    ["2026-05-31T23:59:59Z", "internal", "acetonitrile", 1],
    ["2026-06-01T00:00:00Z", "internal", "acetonitrile", 3],
    ["2026-12-01", "internal", "acetonitrile", 3],
    ["2026-12-01", "external", "acetonitrile", 4],
    ["2026-12-01", "internal", "methanol", 5],
    ["2026-12-01", "internal", "water", null],
  ] as const)("at %s, %s list, %s → rate %s", (at, priceList, reagentId, expected) => {
    const found = rateInForce(rates, { kind: "reagent", reagentId, priceList, currency: "EUR", at: at.length === 10 ? at : new Date(at) });
    expect(found?.id ?? null).toBe(expected);
  });

  it("a later price change never changes the cost of an earlier entry", () => {
    const line = { reagentId: "acetonitrile", volume_mL: "1000", at: "2026-03-15" };
    const before = costLines([line], [rate(1, "2026-01-01", 4200)], { priceList: "internal", currency: "EUR" });
    const after = costLines([line], [rate(1, "2026-01-01", 4200), rate(2, "2026-04-01", 9900)], { priceList: "internal", currency: "EUR" });
    expect(before.amount_minor).toBe(4200); // 1 L × 42.00 €/L, worked by hand
    expect(after.amount_minor).toBe(4200);
  });
});

describe("costing", () => {
  it.each([
    // [quantity, rate per unit (minor), unit, expected exact cost in 10⁻⁹ minor units] — worked by hand
    [{ volume_mL: "250" }, 4200, "L", 1_050n * 10n ** 9n], // 0.25 L × 4200 = 1050 cents
    [{ volume_mL: "0.0001" }, 4200, "L", 420_000n], // 1e-7 L × 4200 = 4.2e-4 cents
    [{ mass_g: "3.405" }, 12, "g", 40_860_000_000n], // 3.405 g × 12 = 40.86 cents
  ] as const)("%o at %i per %s", (quantity, amount_minor, unit, expected) => {
    expect(exactCost(quantity, rate(1, "2026-01-01", amount_minor, { unit }))).toBe(expected);
  });

  it("costs each line at its own day's rate and rounds once, on the total", () => {
    const rates = [rate(1, "2026-01-01", 4200), rate(2, "2026-02-01", 5000)];
    const lines = [
      { reagentId: "acetonitrile", volume_mL: "100.0040", at: "2026-01-20" }, // 0.100004 L × 4200 = 420.0168
      { reagentId: "acetonitrile", volume_mL: "100.0040", at: "2026-02-20" }, // 0.100004 L × 5000 = 500.02
      { reagentId: "formic-acid", volume_mL: "0.2", at: "2026-02-20" }, // no rate
    ];
    // 920.0368 → 920 cents; hand-worked
    expect(costLines(lines, rates, { priceList: "internal", currency: "EUR" })).toEqual({
      amount_minor: 920,
      currency: "EUR",
      uncosted: ["formic-acid"],
    });
  });

  it("a correction nets its entry's cost to zero", () => {
    const rates = [rate(1, "2026-01-01", 4200)];
    const lines = [
      { reagentId: "acetonitrile", volume_mL: "33.3333", at: "2026-01-20" },
      { reagentId: "acetonitrile", volume_mL: "-33.3333", at: "2026-01-20" },
    ];
    expect(costLines(lines, rates, { priceList: "internal", currency: "EUR" }).amount_minor).toBe(0);
  });

  it("has no float drift: the sum of many small entries equals the cost of their total (property)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 1, max: 10_000_000 }), { minLength: 1, maxLength: 200 }),
        fc.integer({ min: 1, max: 100_000 }),
        (tenThousandths, price) => {
          const r = [rate(1, "2026-01-01", price)];
          const lines = tenThousandths.map((n) => ({ reagentId: "acetonitrile", volume_mL: (n / 10_000).toFixed(4), at: "2026-03-01" }));
          const total = tenThousandths.reduce((a, b) => a + b, 0);
          const whole = costLines([{ reagentId: "acetonitrile", volume_mL: (total / 10_000).toFixed(4), at: "2026-03-01" }], r, {
            priceList: "internal",
            currency: "EUR",
          });
          expect(costLines(lines, r, { priceList: "internal", currency: "EUR" }).amount_minor).toBe(whole.amount_minor);
        },
      ),
    );
  });

  it.each([
    ["12.3456", 12_345_600n],
    ["-0.5", -500_000n],
    ["0.0000005", 1n], // half rounds away from zero
    [".25", 250_000n],
  ])("toMicro(%s) = %s", (text, micro) => {
    expect(toMicro(text)).toBe(micro);
  });

  it.each([
    [1_499_999_999n, 1],
    [1_500_000_000n, 2],
    [-1_500_000_000n, -2],
    [0n, 0],
  ])("roundMinor(%s) = %i", (exact, minor) => {
    expect(roundMinor(exact)).toBe(minor);
  });
});

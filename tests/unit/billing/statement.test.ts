import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { Rate } from "../../../src/lib/billing/rates";
import {
  buildStatement,
  csvField,
  decimalAmount,
  journalCsv,
  monthBounds,
  parseMajorAmount,
  quantityLabel,
  statementCsv,
  type UsageRow,
} from "../../../src/lib/billing/statement";

let nextId = 1;
const rate = (over: Partial<Rate>): Rate => ({
  id: nextId++,
  kind: "reagent",
  reagentId: "acetonitrile",
  grade: null,
  priceList: "external",
  unit: "L",
  amount_minor: 7900,
  currency: "EUR",
  effectiveFrom: "2025-01-01",
  ...over,
});
const use = (day: string, volume_mL: string | number, over: Partial<UsageRow> = {}): UsageRow => ({
  projectCode: "QFT-IMP-014",
  projectName: "Impurity profiling",
  reagentId: "acetonitrile",
  reagentName: "Acetonitrile",
  grade: null,
  day,
  volume_mL,
  mass_g: null,
  ...over,
});

describe("statement lines at the rates in force", () => {
  const rates = [rate({ amount_minor: 7900, effectiveFrom: "2025-01-01" }), rate({ amount_minor: 8400, effectiveFrom: "2026-11-16" })];
  const usage = [use("2026-11-03", "1000"), use("2026-11-15", "500"), use("2026-11-16", "250"), use("2026-11-30", "250")];
  const computed = buildStatement({ usage, rates, priceList: "external", currency: "EUR" });

  it("costs each day at the rate in force that day, one line per rate", () => {
    // 1.5 L at €79.00 = €118.50; 0.5 L at €84.00 = €42.00 (worked by hand).
    expect(computed.lines.map((l) => [l.quantity, l.unitPrice_minor, l.rateEffectiveFrom, l.amount_minor])).toEqual([
      ["1500", 7900, "2025-01-01", 11_850],
      ["500", 8400, "2026-11-16", 4_200],
    ]);
    expect(computed.total_minor).toBe(16_050);
  });

  it("a rate that starts after the period changes nothing", () => {
    const later = buildStatement({
      usage,
      rates: [...rates, rate({ amount_minor: 99_900, effectiveFrom: "2026-12-01" })],
      priceList: "external",
      currency: "EUR",
    });
    expect(later).toEqual(computed);
  });

  it("uses the client's price list only", () => {
    const internal = buildStatement({
      usage,
      rates: [...rates, rate({ priceList: "internal", amount_minor: 4200 })],
      priceList: "internal",
      currency: "EUR",
    });
    expect(internal.lines.map((l) => l.amount_minor)).toEqual([8400]); // 2 L at €42.00
  });

  it("a grade-specific rate wins over the general price for that grade", () => {
    const graded = buildStatement({
      usage: [use("2026-11-03", "1000", { grade: "LC-MS" }), use("2026-11-03", "1000", { grade: "HPLC" })],
      rates: [...rates, rate({ grade: "LC-MS", amount_minor: 12_000, effectiveFrom: "2026-01-01" })],
      priceList: "external",
      currency: "EUR",
    });
    expect(graded.lines.map((l) => [l.description, l.amount_minor])).toEqual([
      ["Acetonitrile, grade HPLC", 7900],
      ["Acetonitrile, grade LC-MS", 12_000],
    ]);
  });

  it("one line per price: lots of several grades at the reagent's general price share a line that names the grades", () => {
    // Before: "Acetonitrile" and "Acetonitrile (HPLC)" were two lines at the same €79/L.
    const shared = buildStatement({
      usage: [use("2026-11-03", "1000", { grade: null }), use("2026-11-04", "500", { grade: "HPLC" })],
      rates,
      priceList: "external",
      currency: "EUR",
    });
    expect(shared.lines.map((l) => [l.description, l.quantity, l.amount_minor])).toEqual([["Acetonitrile, grade HPLC", "1500", 11_850]]);
  });

  it("flags reagents without a rate instead of charging them", () => {
    const result = buildStatement({
      usage: [use("2026-11-03", "10", { reagentId: "methanol", reagentName: "Methanol" })],
      rates,
      priceList: "external",
      currency: "EUR",
    });
    expect(result.uncosted).toEqual(["methanol"]);
    expect(result.lines[0]).toMatchObject({ rateId: null, amount_minor: 0 });
  });

  it("charges injection and preparation fees at the fee in force, and leaves out zero fees", () => {
    const result = buildStatement({
      usage: [],
      injections: [
        { projectCode: "P1", projectName: "One", day: "2026-11-02", count: 40 },
        { projectCode: "P1", projectName: "One", day: "2026-11-20", count: 10 },
      ],
      preparations: [{ projectCode: "P1", projectName: "One", day: "2026-11-02", count: 2 }],
      rates: [
        rate({ kind: "injection_fee", reagentId: null, unit: "injection", amount_minor: 150 }),
        rate({ kind: "injection_fee", reagentId: null, unit: "injection", amount_minor: 175, effectiveFrom: "2026-11-15" }),
        rate({ kind: "preparation_fee", reagentId: null, unit: "batch", amount_minor: 0 }),
      ],
      priceList: "external",
      currency: "EUR",
    });
    expect(result.lines.map((l) => [l.description, l.quantity, l.amount_minor])).toEqual([
      ["Injection fee", "40", 6000],
      ["Injection fee", "10", 1750],
    ]);
  });

  it("nets a correction against the entry it reverses", () => {
    const result = buildStatement({
      usage: [use("2026-11-03", "120.5"), use("2026-11-09", "-120.5")],
      rates,
      priceList: "external",
      currency: "EUR",
    });
    expect(result.lines).toEqual([]);
    expect(result.total_minor).toBe(0);
  });
});

describe("money rounding", () => {
  const price = [rate({ amount_minor: 7900 })];
  it.each([
    // [volume mL, expected minor units]: 79 cents per 10 mL → 0.079 cents per 0.01 mL.
    ["6.329", 50], // 50.0 cents exactly: 6.329 mL × 7.9 c/mL = 49.9991 → 50
    ["0.0633", 1], // 0.50007 cents → rounds up
    ["0.0632", 0], // 0.49928 cents → rounds down
    ["0.063292", 1], // 0.5000068 cents: just past the half
    ["0.0632911", 0], // quantities are kept to 10⁻⁶ mL first: 0.063291 mL → 0.4999989 cents
  ])("%s mL of acetonitrile at €79.00/L is %i cents", (volume, expected) => {
    expect(buildStatement({ usage: [use("2026-11-03", volume)], rates: price, priceList: "external", currency: "EUR" }).total_minor).toBe(
      expected,
    );
  });

  it("sums many tiny entries exactly before rounding once (no float drift)", () => {
    // 10 000 × 0.1 mL = 1 L exactly at €79.00; a float sum of 0.1 drifts, the integer sum does not.
    const usage = Array.from({ length: 10_000 }, (_, i) => use(`2026-11-${String((i % 28) + 1).padStart(2, "0")}`, 0.1));
    expect(buildStatement({ usage, rates: price, priceList: "external", currency: "EUR" }).total_minor).toBe(7900);
  });

  it("total = sum of lines, each line = exact micro-volume × price rounded half up (property)", () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.record({
            day: fc.integer({ min: 1, max: 30 }),
            micro: fc.integer({ min: -2_000_000_000, max: 2_000_000_000 }),
            reagent: fc.constantFrom("acetonitrile", "water"),
          }),
          { maxLength: 60 },
        ),
        fc.integer({ min: 0, max: 50_000 }),
        (entries, waterPrice) => {
          const rates = [rate({ amount_minor: 7900 }), rate({ reagentId: "water", amount_minor: waterPrice })];
          const usage = entries.map((e) =>
            use(`2026-11-${String(e.day).padStart(2, "0")}`, (BigInt(e.micro) < 0n ? "-" : "") + (Math.abs(e.micro) / 1e6).toFixed(6), {
              reagentId: e.reagent,
              reagentName: e.reagent,
            }),
          );
          const result = buildStatement({ usage, rates, priceList: "external", currency: "EUR" });
          expect(result.total_minor).toBe(result.lines.reduce((s, l) => s + l.amount_minor, 0));
          for (const line of result.lines) {
            const micro = entries.filter((e) => e.reagent === line.reagentId).reduce((s, e) => s + BigInt(e.micro), 0n);
            const exact = micro * BigInt(line.unitPrice_minor!); // 10⁻⁹ minor units
            const abs = exact < 0n ? -exact : exact;
            const rounded = abs / 1_000_000_000n + ((abs % 1_000_000_000n) * 2n >= 1_000_000_000n ? 1n : 0n);
            expect(line.amount_minor).toBe(Number(exact < 0n ? -rounded : rounded));
          }
        },
      ),
      { numRuns: 200 },
    );
  });

  it.each([
    [123456, "EUR", "1234.56"],
    [-5, "EUR", "-0.05"],
    [7, "EUR", "0.07"],
    [1500, "JPY", "1500"], // no minor digits
  ])("decimalAmount(%i %s) = %s", (amount, currency, text) => {
    expect(decimalAmount({ amount, currency })).toBe(text);
  });

  it.each([
    ["42", 4200],
    ["42.5", 4250],
    ["42,50", 4250],
    ["0.07", 7],
    ["42.505", null], // more digits than the currency has
    ["-1", null],
    ["4e2", null],
  ])("parseMajorAmount(%s) = %s", (text, minor) => {
    expect(parseMajorAmount(text, "EUR")).toBe(minor);
  });
});

describe("CSV exports", () => {
  const lines = buildStatement({
    usage: [
      use("2026-11-03", "1500"),
      use("2026-11-03", "2000", {
        projectCode: "QFT-STB-015",
        projectName: 'Forced degradation, "QF-15"',
        reagentId: "water",
        reagentName: "Water",
      }),
    ],
    rates: [rate({ amount_minor: 7900 }), rate({ reagentId: "water", amount_minor: 400 })],
    priceList: "external",
    currency: "EUR",
  }).lines;

  it("writes a header and one CRLF-terminated row per line, amounts as plain decimals", () => {
    const csv = statementCsv(
      {
        reference: "ST-000007",
        clientName: "Quillfeather Therapeutics",
        periodStart: "2026-11-01",
        periodEnd: "2026-11-30",
        currency: "EUR",
      },
      lines,
    );
    expect(csv.split("\r\n")).toEqual([
      "statement,client,period_start,period_end,project_code,project_name,item,quantity,quantity_unit,unit_price,price_per,amount,currency",
      "ST-000007,Quillfeather Therapeutics,2026-11-01,2026-11-30,QFT-IMP-014,Impurity profiling,Acetonitrile,1500,mL,79.00,L,118.50,EUR",
      'ST-000007,Quillfeather Therapeutics,2026-11-01,2026-11-30,QFT-STB-015,"Forced degradation, ""QF-15""",Water,2000,mL,4.00,L,8.00,EUR',
      "",
    ]);
  });

  it("keeps spreadsheet formulas out of text fields", () => {
    expect(csvField("=HYPERLINK(1)", { text: true })).toBe("'=HYPERLINK(1)");
    expect(csvField("-12.50")).toBe("-12.50"); // numbers are not text fields
  });

  it("journals one row per cost centre and project, leaving out projects with nothing to charge", () => {
    const csv = journalCsv([
      {
        reference: "ST-000001",
        clientName: "Plant Metabolomics Group",
        costCentre: "CC-4102",
        periodStart: "2026-11-01",
        periodEnd: "2026-11-30",
        currency: "EUR",
        lines,
      },
      {
        reference: "ST-000002",
        clientName: "Empty Group",
        costCentre: "CC-9999",
        periodStart: "2026-11-01",
        periodEnd: "2026-11-30",
        currency: "EUR",
        lines: [],
      },
    ]);
    const rows = csv.trimEnd().split("\r\n");
    expect(rows[0]).toBe("cost_centre,project_code,amount,currency,period_start,period_end,reference,description");
    expect(rows.slice(1).map((r) => r.split(",").slice(0, 4).join(","))).toEqual([
      "CC-4102,QFT-IMP-014,118.50,EUR",
      "CC-4102,QFT-STB-015,8.00,EUR",
    ]);
  });

  it.each([
    ["2026-11", "2026-11-01", "2026-11-30"],
    ["2028-02", "2028-02-01", "2028-02-29"], // leap year
    ["2026-12", "2026-12-01", "2026-12-31"],
  ])("month %s runs %s to %s", (month, start, end) => {
    expect(monthBounds(month)).toEqual({ periodStart: start, periodEnd: end });
  });
});

describe("quantities for people", () => {
  it.each([
    ["1119.0598", "mL", "1.12 L"],
    ["2.356", "mL", "2.4 mL"],
    ["3.405", "g", "3.405 g"],
    ["1", "batch", "1 batch"],
    ["222", "injection", "222 injections"],
  ] as const)("%s %s reads %s", (quantity, quantityUnit, text) => {
    expect(quantityLabel({ quantity, quantityUnit })).toBe(text);
  });
});

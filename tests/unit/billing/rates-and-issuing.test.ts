// The rates screen's states and the reasons a draft cannot be issued yet: pure rules that the
// billing services apply to what they load.
import { describe, expect, it } from "vitest";
import { rateStates, type Rate } from "../../../src/lib/billing/rates";
import { issueBlocker, type StatementComputation, type StatementLine } from "../../../src/lib/billing/statement";

let nextId = 1;
const rate = (over: Partial<Rate>): Rate => ({
  id: nextId++,
  kind: "reagent",
  reagentId: "acetonitrile",
  grade: null,
  priceList: "internal",
  unit: "L",
  amount_minor: 4200,
  currency: "EUR",
  effectiveFrom: "2025-01-01",
  ...over,
});

describe("rateStates", () => {
  it("the newest rate started on or before the day is current, older ones superseded, later ones scheduled", () => {
    const old = rate({ effectiveFrom: "2025-01-01" });
    const now = rate({ effectiveFrom: "2025-06-01" });
    const later = rate({ effectiveFrom: "2026-01-01" });
    const states = rateStates([later, old, now], "2025-08-01");
    expect([states.get(old.id), states.get(now.id), states.get(later.id)]).toEqual(["superseded", "current", "scheduled"]);
  });

  it("a rate starting on the day itself is current", () => {
    const old = rate({ effectiveFrom: "2025-01-01" });
    const today = rate({ effectiveFrom: "2025-08-01" });
    const states = rateStates([old, today], "2025-08-01");
    expect(states.get(today.id)).toBe("current");
    expect(states.get(old.id)).toBe("superseded");
  });

  it("of two rates starting the same day, the one entered later is current", () => {
    const first = rate({ effectiveFrom: "2025-03-01", amount_minor: 4000 });
    const second = rate({ effectiveFrom: "2025-03-01", amount_minor: 4100 });
    const states = rateStates([second, first], "2025-04-01");
    expect(states.get(second.id)).toBe("current");
    expect(states.get(first.id)).toBe("superseded");
  });

  it("each price list, reagent, grade, fee and currency has its own current rate", () => {
    const general = rate({});
    const graded = rate({ grade: "LC-MS", effectiveFrom: "2025-02-01" });
    const external = rate({ priceList: "external", effectiveFrom: "2024-01-01" });
    const methanol = rate({ reagentId: "methanol" });
    const fee = rate({ kind: "injection_fee", reagentId: null, unit: "injection", amount_minor: 150 });
    const francs = rate({ currency: "CHF" });
    const states = rateStates([general, graded, external, methanol, fee, francs], "2025-08-01");
    expect([...states.values()]).toEqual(Array(6).fill("current"));
  });

  it("a rate that has not started, with none before it, is scheduled, not current", () => {
    const first = rate({ effectiveFrom: "2026-01-01" });
    expect(rateStates([first], "2025-08-01").get(first.id)).toBe("scheduled");
  });
});

describe("issueBlocker", () => {
  const line: StatementLine = {
    projectCode: "PLT-ROOT-003",
    projectName: "Root exudates",
    kind: "reagent",
    reagentId: "acetonitrile",
    description: "Acetonitrile",
    quantity: "1000",
    quantityUnit: "mL",
    rateId: 1,
    unitPrice_minor: 4200,
    rateUnit: "L",
    rateEffectiveFrom: "2025-01-01",
    amount_minor: 4200,
  };
  const computed = (over: Partial<StatementComputation> = {}): StatementComputation => ({
    lines: [line],
    total_minor: 4200,
    currency: "EUR",
    uncosted: [],
    ...over,
  });

  it("a period that has ended, fully costed and with something to charge, can be issued", () => {
    expect(issueBlocker("2026-11-30", computed(), "2026-12-01")).toBeNull();
  });

  it("a period is issued only once it has ended: not on its last day", () => {
    expect(issueBlocker("2026-11-30", computed(), "2026-11-30")).toMatch(/runs until 2026-11-30/);
    expect(issueBlocker("2026-11-30", computed(), "2026-11-12")).toMatch(/issue it once it has ended/);
  });

  it("names the reagents that had no rate in force", () => {
    expect(issueBlocker("2026-11-30", computed({ uncosted: ["formic-acid", "methanol"] }), "2026-12-01")).toMatch(
      /No rate in force for formic-acid, methanol/,
    );
  });

  it("refuses a statement with nothing to charge, whether it has no lines or they sum to zero", () => {
    expect(issueBlocker("2026-11-30", computed({ lines: [], total_minor: 0 }), "2026-12-01")).toBe("Nothing to charge in this period.");
    const reversed = { ...line, quantity: "-1000", amount_minor: -4200 };
    expect(issueBlocker("2026-11-30", computed({ lines: [line, reversed], total_minor: 0 }), "2026-12-01")).toBe(
      "Nothing to charge in this period.",
    );
  });
});

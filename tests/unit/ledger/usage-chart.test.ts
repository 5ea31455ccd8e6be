import { describe, expect, it } from "vitest";
import { usageChartSeries, type UsageChartGroup } from "../../../src/lib/ledger/usage-chart";

const eur = (amount: number) => ({ amount, currency: "EUR" });

describe("usageChartSeries", () => {
  it("keeps the table's order and draws volume and cost when the groups share one currency", () => {
    const groups: UsageChartGroup[] = [
      { label: "PRJ-B", volume_mL: 2500, costs: [eur(4200)] },
      { label: "PRJ-A", volume_mL: 120, costs: [eur(0)] },
    ];
    const series = usageChartSeries(groups);
    expect(series.labels).toEqual(["PRJ-B", "PRJ-A"]);
    expect(series.volumes_mL).toEqual([2500, 120]);
    expect(series.cost).toEqual({ currency: "EUR", amounts: [4200, 0] });
    expect(series.description).toBe("PRJ-B: 2.5 L, €42.00; PRJ-A: 120 mL, €0.00.");
  });

  it.each([
    // [case, groups, what the description ends with]
    ["no group has a cost (no rates yet)", [{ label: "acetonitrile", volume_mL: 900, costs: [eur(0)] }], "acetonitrile: 900 mL."],
    ["groups without any cost entry", [{ label: "2026-03", volume_mL: 40, costs: [] }], "2026-03: 40 mL."],
  ])("leaves cost out when %s", (_case, groups, description) => {
    const series = usageChartSeries(groups);
    expect(series.cost).toBeNull();
    expect(series.description).toBe(description);
  });

  it("leaves cost to the table when groups are billed in more than one currency, and says so", () => {
    const series = usageChartSeries([
      { label: "Internal client", volume_mL: 1000, costs: [eur(500)] },
      { label: "Outside client", volume_mL: 3000, costs: [{ amount: 900, currency: "GBP" }] },
    ]);
    expect(series.cost).toBeNull();
    expect(series.description).toBe("Internal client: 1 L; Outside client: 3 L. Costs are in EUR and GBP: the table lists them.");
  });

  it("gives a group without a cost a gap, not a zero, beside groups that have one", () => {
    const series = usageChartSeries([
      { label: "Wren", volume_mL: 10, costs: [eur(150)] },
      { label: "none", volume_mL: 5, costs: [] },
    ]);
    expect(series.cost?.amounts).toEqual([150, null]);
  });
});

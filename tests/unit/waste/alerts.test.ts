// Fill and accumulation alerts. The limits are example values (80 %, 180 days, 14 days' warning);
// the institution's rules and local regulations decide the real ones.
import { describe, expect, it } from "vitest";
import { accumulationState, alertMessage, containerAlerts, EXAMPLE_LIMITS, fillState } from "../../../src/lib/waste/alerts";
import { periodBounds } from "../../../src/lib/ledger/period";
import { monthsIn, periodFor, previousPeriod } from "../../../src/lib/waste/period";

describe("fillState at an 80 % threshold", () => {
  it.each([
    [0, 20_000, 0, "ok"],
    [15_980, 20_000, 79, "ok"], // 79.9 % shows as 79 %, not rounded up into an alert
    [16_000, 20_000, 80, "near-full"],
    [19_999, 20_000, 99, "near-full"],
    [20_000, 20_000, 100, "near-full"], // exactly full is not yet over capacity
    [20_001, 20_000, 100, "over-capacity"],
    [-50, 10_000, 0, "ok"], // a negative estimate (a correction after a reading) counts as empty
  ])("%d of %d mL → %d %% %s", (estimated, capacity, percent, state) => {
    expect(fillState(estimated, capacity, 80)).toEqual({ percent, state });
  });
});

describe("accumulationState against a 180-day limit with 14 days' warning", () => {
  const start = new Date("2026-06-01T09:00:00Z");
  const day = (n: number) => new Date(start.getTime() + n * 86_400_000);
  it.each([
    [0, "ok", 180],
    [165, "ok", 15],
    [166, "approaching", 14],
    [179.5, "approaching", 1],
    [180, "over", 0],
    [200, "over", -20],
  ])("day %d → %s (%d days left)", (n, state, daysLeft) => {
    const info = accumulationState(start, day(n), EXAMPLE_LIMITS);
    expect(info.state).toBe(state);
    expect(info.daysLeft).toBe(daysLeft);
  });
});

describe("containerAlerts", () => {
  const now = new Date("2026-12-01T12:00:00Z");
  const base = {
    status: "in_use" as const,
    capacity_mL: 10_000,
    estimated_mL: 1_000,
    accumulationStartedAt: new Date("2026-11-01T00:00:00Z"),
  };
  it("raises nothing for a young, part-filled container", () => expect(containerAlerts(base, EXAMPLE_LIMITS, now)).toEqual([]));
  it("raises near-full at the threshold", () =>
    expect(containerAlerts({ ...base, estimated_mL: 8_000 }, EXAMPLE_LIMITS, now)).toEqual(["near-full"]));
  it("raises over-capacity instead of near-full", () =>
    expect(containerAlerts({ ...base, estimated_mL: 10_500 }, EXAMPLE_LIMITS, now)).toEqual(["over-capacity"]));
  it("raises the accumulation warning with the fill alert", () => {
    expect(
      containerAlerts({ ...base, estimated_mL: 9_000, accumulationStartedAt: new Date("2026-06-10T00:00:00Z") }, EXAMPLE_LIMITS, now),
    ).toEqual(["near-full", "accumulation-approaching"]);
  });
  it("keeps the accumulation clock on a container waiting for pickup, but not the fill alert", () => {
    expect(
      containerAlerts(
        { ...base, status: "awaiting_pickup", estimated_mL: 9_900, accumulationStartedAt: new Date("2026-05-01T00:00:00Z") },
        EXAMPLE_LIMITS,
        now,
      ),
    ).toEqual(["accumulation-over"]);
  });
  it("raises nothing once collected", () =>
    expect(containerAlerts({ ...base, status: "collected", estimated_mL: 20_000 }, EXAMPLE_LIMITS, now)).toEqual([]));
  it("follows an edited threshold", () =>
    expect(containerAlerts({ ...base, estimated_mL: 7_000 }, { ...EXAMPLE_LIMITS, fullThreshold_percent: 70 }, now)).toEqual([
      "near-full",
    ]));
});

describe("alertMessage", () => {
  const container = { code: "WC-0103", fill: { percent: 84 }, accumulation: { days: 170, daysLeft: 10 } };
  it.each([
    ["near-full", "WC-0103 is at 84 % of its capacity (threshold 80 %); request a pickup or swap the container."],
    ["accumulation-approaching", "WC-0103 has been accumulating for 170 days; the site's limit (180 days) is reached in 10 days."],
  ] as const)("%s names the container, its figure and the site's limit", (kind, message) => {
    expect(alertMessage(container, kind, EXAMPLE_LIMITS)).toBe(message);
  });
  it("follows an edited limit", () =>
    expect(alertMessage(container, "accumulation-over", { ...EXAMPLE_LIMITS, accumulationLimit_days: 90 })).toMatch(
      /past the site's limit of 90 days/,
    ));
});

describe("reporting periods", () => {
  const day = new Date("2026-11-18T10:00:00Z");
  it.each([
    ["month", { from: "2026-11-01", to: "2026-11-30" }],
    ["quarter", { from: "2026-10-01", to: "2026-12-31" }],
    ["year", { from: "2026-01-01", to: "2026-12-31" }],
  ] as const)("%s", (preset, expected) => expect(periodFor(preset, day)).toEqual(expected));
  it("goes back across a year end", () => {
    expect(previousPeriod("month", new Date("2026-01-15T00:00:00Z"))).toEqual({ from: "2025-12-01", to: "2025-12-31" });
    expect(previousPeriod("quarter", new Date("2026-02-15T00:00:00Z"))).toEqual({ from: "2025-10-01", to: "2025-12-31" });
  });
  it("includes the whole last day", () => {
    // A waste period is the one period definition (lib/ledger/period.ts), here in UTC.
    const [start, end] = periodBounds("2026-02-01", "2026-02-28", "UTC");
    expect(start.toISOString()).toBe("2026-02-01T00:00:00.000Z");
    expect(end.toISOString()).toBe("2026-03-01T00:00:00.000Z");
  });
  it("lists the months a period touches", () =>
    expect(monthsIn({ from: "2026-10-15", to: "2027-01-02" })).toEqual(["2026-10", "2026-11", "2026-12", "2027-01"]));
});

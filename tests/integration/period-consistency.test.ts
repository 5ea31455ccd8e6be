// One figure per question: for the same days, the overview, /usage and a statement report the same
// runs and litres, because all three read the one period definition (lib/ledger/period.ts).
// Before, the overview's rolling 30 × 24 h window and its own run count disagreed with /usage.
import { describe, expect, it } from "vitest";
import { localDay } from "../../src/lib/format";
import { lastDays } from "../../src/lib/ledger/period";
import { getFacilitySettings } from "../../src/lib/server/services/facility-settings";
import { computeStatement } from "../../src/lib/server/services/billing/statement-lines";
import { recentUsageByProject } from "../../src/lib/server/services/overview";
import { usageByProject } from "../../src/lib/server/services/usage";
import { useServiceDatabase } from "../support/service-database";

useServiceDatabase();
const QUILLFEATHER = 4;

describe("the same period on every screen and document", () => {
  it("overview, usage and the statement agree per project on runs and volume for the last 30 days", async () => {
    // Noon, so a rolling 30 × 24 h window would start mid-day and differ from whole days.
    const now = new Date();
    now.setUTCHours(12, 0, 0, 0);
    const { timeZone } = await getFacilitySettings();
    const period = lastDays(30, now, timeZone);
    expect(period.to).toBe(localDay(now, timeZone));
    const overview = await recentUsageByProject(period);
    const usage = await usageByProject({ ...period, groupBy: "project" }, { clientId: null });
    const used = overview.filter((p) => p.volume_mL > 0);
    expect(used.length).toBeGreaterThan(0);
    for (const project of overview) {
      const row = usage.rows.find((r) => r.projectCode === project.projectCode);
      const volume = row ? Object.values(row.volumes_mL).reduce((s, v) => s + v, 0) : 0;
      expect(project.volume_mL, project.projectCode).toBeCloseTo(volume, 3);
      expect(project.runs, project.projectCode).toBe(row?.runs ?? 0);
    }
    const statement = await computeStatement(QUILLFEATHER, period.from, period.to);
    for (const project of overview.filter((p) => p.clientName === "Quillfeather Therapeutics")) {
      const billed = statement.lines
        .filter((l) => l.projectCode === project.projectCode && l.quantityUnit === "mL")
        .reduce((s, l) => s + Number(l.quantity), 0);
      expect(billed, project.projectCode).toBeCloseTo(project.volume_mL, 3);
    }
  });
});

// The facility's zone at a change of the clocks, north (Europe/Berlin, the demo's) and south
// (Australia/Sydney) of the equator: usage periods and the per-day sums cover exactly the local
// days, a new zone rebuilds the sums, and the expiry digest goes out at 06:00 local. Transition
// dates from the IANA tz database rules: the EU changes at 01:00 UTC on the last Sundays of March
// and October (30 March 2031), New South Wales at 03:00 AEDT on the first Sunday of April (6 April 2031).
// 2031 holds none of the demo data (which is dated around the day it is seeded).
import { QueryTypes } from "sequelize";
import { describe, expect, it } from "vitest";
import { periodBounds } from "../../src/lib/ledger/period";
import { runExpiryDigest } from "../../src/lib/server/services/expiry-digest";
import { getFacilitySettings, saveFacilitySettings } from "../../src/lib/server/services/facility-settings";
import { usageByProject } from "../../src/lib/server/services/usage";
import { actor, useServiceDatabase } from "../support/service-database";

const db = useServiceDatabase();
const admin = actor(1, "admin");
const q = <T extends object>(sql: string, replacements: unknown[] = []) =>
  db.sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });

async function subject() {
  const [project] = await q<{ id: number; code: string }>("SELECT id, code FROM projects ORDER BY id LIMIT 1");
  const [reagent] = await q<{ id: string }>("SELECT id FROM reagents ORDER BY id LIMIT 1");
  return { project: project!, reagent: reagent!.id };
}

/** Draws of `volume` mL at each instant (UTC), straight into the ledger as any writer would. */
async function draw(projectId: number, reagentId: string, entries: [string, number][]) {
  for (const [at, volume] of entries) {
    await db.sequelize.query(
      "INSERT INTO ledger_entries (occurred_at, project_id, kind, reagent_id, volume_ml, source_kind, source_id, created_at) VALUES (?, ?, 'draw', ?, ?, 'manual', 'tz-test', NOW(3))",
      { replacements: [at.replace("T", " ").replace("Z", ""), projectId, reagentId, volume] },
    );
  }
}

const volumeIn = async (from: string, to: string, code: string, reagent: string) =>
  (await usageByProject({ from, to, groupBy: "project" }, { clientId: null })).rows.find((r) => r.projectCode === code)?.volumes_mL[
    reagent
  ] ?? 0;

describe("the facility's local days", () => {
  it("the demo facility works in Europe/Berlin", async () => {
    expect(await getFacilitySettings()).toEqual({ timeZone: "Europe/Berlin", locale: "en-GB", currency: "EUR" });
  });

  it("a usage period in Berlin covers exactly the instants of its local days, across the spring change", async () => {
    const { project, reagent } = await subject();
    await draw(project.id, reagent, [
      ["2031-02-28T22:59:59Z", 1], // 23:59:59 CET on 28 February: before
      ["2031-02-28T23:00:00Z", 10], // midnight CET, 1 March: in
      ["2031-03-30T00:30:00Z", 100], // 01:30 CET on the day the clocks go forward: in
      ["2031-03-30T01:30:00Z", 1_000], // 03:30 CEST, the same day: in
      ["2031-03-31T21:59:59Z", 10_000], // 23:59:59 CEST on 31 March: in
      ["2031-03-31T22:00:00Z", 100_000], // midnight CEST, 1 April: after
    ]);
    // UTC days would count 11,110 + 100,000 and leave out the first March 10 mL.
    expect(await volumeIn("2031-03-01", "2031-03-31", project.code, reagent)).toBe(11_110);
    expect(await volumeIn("2031-03-30", "2031-03-30", project.code, reagent)).toBe(1_100);
    expect(await volumeIn("2031-04-01", "2031-04-01", project.code, reagent)).toBe(100_000);
    const [start, end] = periodBounds("2031-03-01", "2031-03-31", "Europe/Berlin");
    const [direct] = await q<{ v: number }>(
      "SELECT SUM(volume_ml) AS v FROM ledger_entries WHERE source_id = 'tz-test' AND occurred_at >= ? AND occurred_at < ?",
      [start, end],
    );
    expect(direct!.v).toBe(11_110);
  });

  it("the digest goes out at 06:00 in Berlin on the day the clocks go forward", async () => {
    const send = async () => {};
    expect((await runExpiryDigest({ now: new Date("2031-03-30T03:59:00Z"), send })).ran).toBe(false); // 05:59 CEST
    const sent = await runExpiryDigest({ now: new Date("2031-03-30T04:00:00Z"), send }); // 06:00 CEST
    expect(sent).toMatchObject({ ran: true, sentFor: "2031-03-30" });
  });

  it("a new zone rebuilds the per-day sums in its local days, and later entries follow it", async () => {
    const { project, reagent } = await subject();
    const saved = await saveFacilitySettings({ timeZone: "Australia/Sydney" }, admin);
    expect(saved.timeZone).toBe("Australia/Sydney");
    // The same entries fall on Sydney's days now: 23:59:59 CET on 28 February is 09:59:59 AEDT on
    // 1 March (in March), 23:59:59 CEST on 31 March is 08:59:59 AEDT on 1 April (out).
    expect(await volumeIn("2031-03-01", "2031-03-31", project.code, reagent)).toBe(1_111);
    expect(await volumeIn("2031-04-01", "2031-04-01", project.code, reagent)).toBe(110_000);
    expect(await volumeIn("2031-02-28", "2031-02-28", project.code, reagent)).toBe(0);

    await draw(project.id, reagent, [
      ["2031-04-05T12:59:59Z", 2], // 23:59:59 AEDT on 5 April
      ["2031-04-05T13:00:00Z", 20], // midnight AEDT, 6 April (the clocks go back at 03:00)
      ["2031-04-05T15:30:00Z", 200], // the first 02:30 (AEDT)
      ["2031-04-05T16:30:00Z", 2_000], // the second 02:30 (AEST)
      ["2031-04-06T13:59:59Z", 20_000], // 23:59:59 AEST on 6 April
      ["2031-04-06T14:00:00Z", 200_000], // midnight AEST, 7 April
    ]);
    expect(await volumeIn("2031-04-06", "2031-04-06", project.code, reagent)).toBe(22_220);
    expect(await volumeIn("2031-04-05", "2031-04-05", project.code, reagent)).toBe(2);
    const [start, end] = periodBounds("2031-04-06", "2031-04-06", "Australia/Sydney");
    expect(end.getTime() - start.getTime()).toBe(25 * 3_600_000);

    // The sums hold every entry exactly once.
    const [sums] = await q<{ v: number; n: number }>("SELECT SUM(volume_ml) AS v, SUM(entries) AS n FROM ledger_daily");
    const [entries] = await q<{ v: number; n: number }>(
      "SELECT SUM(volume_ml) AS v, COUNT(*) AS n FROM ledger_entries WHERE project_id IS NOT NULL",
    );
    expect(sums).toEqual(entries);
    const [audit] = await q<{ n: number }>("SELECT COUNT(*) AS n FROM audit_log WHERE entity = 'facility-settings'");
    expect(audit!.n).toBe(1);
  });

  it("the digest goes out at 06:00 in Sydney on the day the clocks go back", async () => {
    const send = async () => {};
    expect((await runExpiryDigest({ now: new Date("2031-04-05T18:59:00Z"), send })).ran).toBe(false); // 05:59 AEST
    expect(await runExpiryDigest({ now: new Date("2031-04-05T20:00:00Z"), send })).toMatchObject({ ran: true, sentFor: "2031-04-06" }); // 06:00 AEST
  });
});

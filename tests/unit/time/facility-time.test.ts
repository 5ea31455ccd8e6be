// The facility's zone at a change of the clocks, north (Europe/Berlin) and south (Australia/Sydney)
// of the equator. Transition instants are those of the IANA tz database (tzdata "europe" and
// "australasia" files): the EU rule changes at 01:00 UTC on the last Sundays of March and October;
// New South Wales at 02:00 standard time on the first Sundays of October and April.
import { describe, expect, it } from "vitest";
import {
  formatDay,
  formatInstant,
  formatLabelInstant,
  isoWithOffset,
  localDay,
  offsetChanges,
  parseLocalDateTime,
  startOfLocalDay,
  utcOffsetMinutes,
} from "../../../src/lib/format";
import { periodBounds } from "../../../src/lib/ledger/period";
import { facilitySettingsPatch } from "../../../src/lib/schemas/facility";
import { runFormSchema } from "../../../src/lib/schemas/runs";

const BERLIN = "Europe/Berlin";
const SYDNEY = "Australia/Sydney";
const HOUR = 3_600_000;

describe("typed wall-clock times at a change of the clocks", () => {
  it.each([
    // zone, typed, expected UTC instant, repeated
    [BERLIN, "2026-03-29T01:59", "2026-03-29T00:59:00.000Z", false],
    [BERLIN, "2026-03-29T03:00", "2026-03-29T01:00:00.000Z", false],
    [BERLIN, "2026-10-25T02:30", "2026-10-25T00:30:00.000Z", true], // first 02:30, still CEST (+02:00)
    [BERLIN, "2026-10-25T02:30+01:00", "2026-10-25T01:30:00.000Z", false], // the second, named by its offset
    [BERLIN, "2026-10-25T03:00", "2026-10-25T02:00:00.000Z", false],
    [SYDNEY, "2026-04-05T02:30", "2026-04-04T15:30:00.000Z", true], // first 02:30, still AEDT (+11:00)
    [SYDNEY, "2026-04-05T02:30+10:00", "2026-04-04T16:30:00.000Z", false],
    [SYDNEY, "2026-10-04T01:59", "2026-10-03T15:59:00.000Z", false],
    [SYDNEY, "2026-10-04T03:00", "2026-10-03T16:00:00.000Z", false],
  ] as const)("%s %s is %s", (zone, typed, utc, repeated) => {
    const reading = parseLocalDateTime(typed, zone);
    expect(reading).toMatchObject({ ok: true, instant: new Date(utc) });
    expect(reading.ok && reading.repeated === true).toBe(repeated);
  });

  it.each([
    [BERLIN, "2026-03-29T02:30"],
    [SYDNEY, "2026-10-04T02:15"],
  ])("refuses %s %s, a time the clocks skip, naming the change", (zone, typed) => {
    const reading = parseLocalDateTime(typed, zone);
    expect(reading.ok).toBe(false);
    expect(!reading.ok && reading.message).toMatch(
      new RegExp(`does not exist .* in ${zone.replace("/", "\\/")}: the clocks go forward 60 minutes`),
    );
  });

  it("the run form reads the start time in the facility's zone and puts the gap's message on the field", () => {
    const base = {
      instrumentId: 1,
      methodId: 1,
      projectId: 1,
      injections: 1,
      channelBatches: { A: 1 },
      idempotencyKey: "run-0123456789abcdef",
    };
    const ok = runFormSchema(SYDNEY).safeParse({ ...base, startedAt: "2026-10-04T03:30" });
    expect(ok.success && ok.data.startedAt.toISOString()).toBe("2026-10-03T16:30:00.000Z");
    const gap = runFormSchema(BERLIN).safeParse({ ...base, startedAt: "2026-03-29T02:30" });
    expect(gap.success).toBe(false);
    expect(gap.error?.issues[0]?.path).toEqual(["startedAt"]);
    expect(gap.error?.issues[0]?.message).toMatch(/does not exist on 2026-03-29 in Europe\/Berlin/);
  });
});

describe("local days and periods", () => {
  it("a March in Berlin is 31 days less the hour skipped, an April in Sydney 30 days and the hour repeated", () => {
    const [start, end] = periodBounds("2026-03-01", "2026-03-31", BERLIN);
    expect(start.toISOString()).toBe("2026-02-28T23:00:00.000Z"); // midnight CET
    expect(end.toISOString()).toBe("2026-03-31T22:00:00.000Z"); // midnight CEST
    expect(end.getTime() - start.getTime()).toBe((31 * 24 - 1) * HOUR);
    const [aStart, aEnd] = periodBounds("2026-04-01", "2026-04-30", SYDNEY);
    expect(aStart.toISOString()).toBe("2026-03-31T13:00:00.000Z"); // midnight AEDT
    expect(aEnd.toISOString()).toBe("2026-04-30T14:00:00.000Z"); // midnight AEST
    expect(aEnd.getTime() - aStart.getTime()).toBe((30 * 24 + 1) * HOUR);
  });

  it("an instant belongs to the local day its zone's clock shows", () => {
    expect(localDay(new Date("2026-03-31T22:30:00Z"), BERLIN)).toBe("2026-04-01");
    expect(localDay(new Date("2026-03-31T21:59:59Z"), BERLIN)).toBe("2026-03-31");
    expect(localDay(new Date("2026-04-30T13:59:59Z"), SYDNEY)).toBe("2026-04-30");
    expect(localDay(new Date("2026-04-30T14:00:00Z"), SYDNEY)).toBe("2026-05-01");
    // A zone whose clocks skip midnight (America/Santiago, first Sunday of September 2026): the day starts at 01:00.
    expect(startOfLocalDay("2026-09-06", "America/Santiago").toISOString()).toBe("2026-09-06T04:00:00.000Z");
  });

  it("lists the offset changes the database sums by, to the minute", () => {
    const in2026 = (zone: string) =>
      offsetChanges(zone, 2026, 2026)
        .slice(1)
        .map((c) => [c.startsAt.toISOString(), c.offsetMinutes]);
    expect(in2026(BERLIN)).toEqual([
      ["2026-03-29T01:00:00.000Z", 120],
      ["2026-10-25T01:00:00.000Z", 60],
    ]);
    expect(in2026(SYDNEY)).toEqual([
      ["2026-04-04T16:00:00.000Z", 600],
      ["2026-10-03T16:00:00.000Z", 660],
    ]);
    expect(utcOffsetMinutes(new Date("2026-07-01T00:00:00Z"), SYDNEY)).toBe(600);
  });
});

describe("times shown", () => {
  const berlin = { timeZone: BERLIN, locale: "en-GB" };
  it("on screens in the locale with the zone's name, on labels in ISO order (the offset where CLDR has no English short name), in CSV with the offset", () => {
    expect(formatInstant("2026-03-29T00:30:00Z", berlin)).toBe("29 Mar 2026, 01:30 CET");
    expect(formatInstant("2026-03-29T01:30:00Z", berlin)).toBe("29 Mar 2026, 03:30 CEST");
    expect(formatInstant("2026-03-29T01:30:00Z", { timeZone: BERLIN, locale: "de-DE" })).toBe("29. März 2026, 03:30 MESZ");
    expect(formatLabelInstant("2026-10-25T00:30:00Z", BERLIN)).toBe("2026-10-25 02:30 CEST");
    expect(formatLabelInstant("2026-10-25T01:30:00Z", BERLIN)).toBe("2026-10-25 02:30 CET");
    expect(formatLabelInstant("2026-04-04T15:30:00Z", SYDNEY)).toBe("2026-04-05 02:30 GMT+11");
    expect(formatLabelInstant("2026-04-04T16:30:00Z", SYDNEY)).toBe("2026-04-05 02:30 GMT+10");
    expect(isoWithOffset("2026-10-25T00:30:00Z", BERLIN)).toBe("2026-10-25T02:30:00+02:00");
    expect(isoWithOffset("2026-10-25T01:30:00Z", BERLIN)).toBe("2026-10-25T02:30:00+01:00");
    expect(formatDay(new Date("2026-03-31T22:30:00Z"), berlin)).toBe("01 Apr 2026");
  });
});

describe("PUT /api/settings/facility's fields", () => {
  it("accepts IANA zones, locales and currencies, and names the field of a bad one", () => {
    expect(facilitySettingsPatch.parse({ timeZone: "europe/berlin", locale: "de-de", currency: "chf" })).toEqual({
      timeZone: "Europe/Berlin",
      locale: "de-DE",
      currency: "CHF",
    });
    for (const [field, value] of [
      ["timeZone", "Mars/Olympus_Mons"],
      ["timeZone", "+01:00"],
      ["locale", "not a locale"],
      ["currency", "EURO"],
    ] as const) {
      const parsed = facilitySettingsPatch.safeParse({ [field]: value });
      expect(parsed.success, `${field} ${value}`).toBe(false);
      expect(parsed.error?.issues[0]?.path).toEqual([field]);
    }
    expect(facilitySettingsPatch.safeParse({ colour: "red" }).success).toBe(false);
  });
});

// The waste settings as stored: JSON values of the settings table, read back whatever shape they
// come in. The example limits (80 %, 180 days, 14 days) are Decant's examples, not a regulation.
import { describe, expect, it } from "vitest";
import { EXAMPLE_LIMITS } from "../../../src/lib/waste/alerts";
import { WASTE_SETTING_KEYS, wasteSettingsFrom } from "../../../src/lib/waste/settings";

const stored = (values: Record<string, unknown>) => (key: string) => values[key];

describe("wasteSettingsFrom", () => {
  it("takes the example values when nothing is stored", () => {
    expect(wasteSettingsFrom(stored({}))).toEqual({ ...EXAMPLE_LIMITS, roomLimits_L: {}, reagentStreams: {} });
  });

  it.each<[string, unknown, number]>([
    ["a number", 85, 85],
    ["a number written as text", "85", 85],
    ["blank text", " ", EXAMPLE_LIMITS.fullThreshold_percent],
    ["text that is no number", "eighty", EXAMPLE_LIMITS.fullThreshold_percent],
    ["infinity", Infinity, EXAMPLE_LIMITS.fullThreshold_percent],
    ["null", null, EXAMPLE_LIMITS.fullThreshold_percent],
  ])("reads the fill threshold from %s", (_, value, expected) => {
    expect(wasteSettingsFrom(stored({ [WASTE_SETTING_KEYS.fullThreshold_percent]: value })).fullThreshold_percent).toBe(expected);
  });

  it("keeps the room limits that are numbers, from an object or from JSON text", () => {
    const limits = { "B2.14": 60, "B2.16": "40", Store: "n/a" };
    expect(wasteSettingsFrom(stored({ [WASTE_SETTING_KEYS.roomLimits_L]: limits })).roomLimits_L).toEqual({ "B2.14": 60, "B2.16": 40 });
    expect(wasteSettingsFrom(stored({ [WASTE_SETTING_KEYS.roomLimits_L]: JSON.stringify(limits) })).roomLimits_L).toEqual({
      "B2.14": 60,
      "B2.16": 40,
    });
  });

  it.each<[string, unknown]>([
    ["unreadable JSON", "{B2.14: 60"],
    ["a list", [60, 40]],
    ["a number", 60],
  ])("reads no room limits from %s", (_, value) => {
    expect(wasteSettingsFrom(stored({ [WASTE_SETTING_KEYS.roomLimits_L]: value })).roomLimits_L).toEqual({});
  });

  it("keeps only the reagent overrides that name a stream", () => {
    const overrides = { "trifluoroacetic-acid": "halogenated-organic", water: 3 };
    expect(wasteSettingsFrom(stored({ [WASTE_SETTING_KEYS.reagentStreams]: overrides })).reagentStreams).toEqual({
      "trifluoroacetic-acid": "halogenated-organic",
    });
  });
});

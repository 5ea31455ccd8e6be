// Stream assignment. Source of the expected streams: common practice for laboratory waste
// segregation (CPwaste in src/lib/chem/sources.ts) — the institution's rules decide in the end.
import { describe, expect, it } from "vitest";
import {
  assignWasteStream,
  DEFAULT_STREAMS,
  effectiveRule,
  streamAccepts,
  WasteRuleError,
  type MixPart,
} from "../../../src/lib/waste/streams";
import type { StreamRule } from "../../../src/lib/waste/types";

const mL = (reagentId: string, volume_mL: number): MixPart => ({ reagentId, volume_mL });
const g = (reagentId: string, mass_g: number): MixPart => ({ reagentId, mass_g });

describe("assignWasteStream with the common-practice defaults", () => {
  it.each<[string, MixPart[], string]>([
    // Gradient waste of 0.1 % formic acid in water and in acetonitrile, mixed 1:1.
    ["ACN / water / formic acid", [mL("water", 499.5), mL("acetonitrile", 499.5), mL("formic-acid", 1)], "non-halogenated-organic"],
    ["methanol / water", [mL("water", 600), mL("methanol", 400)], "non-halogenated-organic"],
    // Any organic share makes the whole mix solvent waste (threshold 0 %).
    ["a buffer with 2 % methanol", [mL("water", 980), mL("methanol", 20), g("ammonium-acetate", 0.77)], "non-halogenated-organic"],
    // TFA is halogenated in the catalogue (at sites that treat it so): 0.1 % is enough.
    ["0.1 % TFA in water / ACN", [mL("water", 499.5), mL("acetonitrile", 499.5), mL("trifluoroacetic-acid", 1)], "halogenated-organic"],
    ["0.05 % TFA in water only", [mL("water", 999.5), mL("trifluoroacetic-acid", 0.5)], "halogenated-organic"],
    // Buffer only: 25 mM phosphate pH 3.0 (KH2PO4 3.4 g/L, a little phosphoric acid).
    ["phosphate buffer only", [mL("water", 1000), g("potassium-dihydrogen-phosphate", 3.4), mL("phosphoric-acid", 0.6)], "aqueous"],
    ["ammonium formate buffer", [mL("water", 1000), g("ammonium-formate", 0.63), mL("formic-acid", 0.3)], "aqueous"],
    // A concentrated acid rinse: 20 % v/v phosphoric acid reaches the corrosive threshold (10 %).
    ["20 % phosphoric acid rinse", [mL("water", 800), mL("phosphoric-acid", 200)], "acidic-corrosive"],
    // Corrosive and organic: the corrosive stream is more restrictive.
    ["15 % formic acid in ACN", [mL("acetonitrile", 850), mL("formic-acid", 150)], "acidic-corrosive"],
  ])("%s → %s", (_name, parts, expected) => {
    expect(assignWasteStream(parts).streamId).toBe(expected);
  });

  it("says why, naming the threshold a dilute acid did not reach", () => {
    const result = assignWasteStream([mL("water", 499.5), mL("acetonitrile", 499.5), mL("formic-acid", 1)]);
    expect(result.reason).toMatch(/^Non-halogenated organic/);
    expect(result.reason).toMatch(/Acidic \/ corrosive 0\.1 % \(below 10 %\)/);
    expect(result.shares["acidic-corrosive"]).toBeCloseTo(0.1, 6);
  });
});

describe("assignWasteStream with site rules", () => {
  const rules: StreamRule[] = DEFAULT_STREAMS.map((s) => ({ ...s }));

  it("follows a site that routes TFA to the corrosive stream instead", () => {
    const parts = [mL("water", 499.5), mL("acetonitrile", 499.5), mL("trifluoroacetic-acid", 1)];
    expect(assignWasteStream(parts, rules, { "trifluoroacetic-acid": "acidic-corrosive" }).streamId).toBe("non-halogenated-organic");
  });

  it("lets a safety officer lower the corrosive threshold", () => {
    const strict = rules.map((r) => (r.id === "acidic-corrosive" ? { ...r, minShare_percent: 0 } : r));
    expect(assignWasteStream([mL("water", 999), mL("formic-acid", 1)], strict).streamId).toBe("acidic-corrosive");
    expect(assignWasteStream([mL("water", 999), mL("formic-acid", 1)], rules).streamId).toBe("aqueous");
  });

  it("honours the restrictiveness the site gives its streams", () => {
    const swapped = rules.map((r) => (r.id === "acidic-corrosive" ? { ...r, restrictiveness: 9 } : r));
    expect(assignWasteStream([mL("water", 500), mL("trifluoroacetic-acid", 100), mL("formic-acid", 400)], swapped).streamId).toBe(
      "acidic-corrosive",
    );
    expect(assignWasteStream([mL("water", 500), mL("trifluoroacetic-acid", 100), mL("formic-acid", 400)], rules).streamId).toBe(
      "halogenated-organic",
    );
  });

  it("refuses what it cannot route", () => {
    expect(() => assignWasteStream([mL("mystery-solvent", 10)])).toThrow(WasteRuleError);
    expect(() => assignWasteStream([g("ammonium-formate", 1)])).toThrow(/no liquid volume/);
    expect(() => assignWasteStream([mL("water", -5), mL("methanol", 10)])).toThrow(/non-negative/);
  });
});

describe("streamAccepts", () => {
  const byId = Object.fromEntries(DEFAULT_STREAMS.map((s) => [s.id, s]));
  it.each([
    ["non-halogenated-organic", "non-halogenated-organic", true],
    ["non-halogenated-organic", "halogenated-organic", false], // the refusal the run logger makes
    ["halogenated-organic", "non-halogenated-organic", true], // costlier, but allowed by default
    ["non-halogenated-organic", "aqueous", true],
    ["aqueous", "non-halogenated-organic", false],
    ["acidic-corrosive", "non-halogenated-organic", false],
  ])("a %s container takes %s: %s", (container, mix, expected) => {
    expect(streamAccepts(byId[container]!, mix)).toBe(expected);
  });
});

describe("effectiveRule", () => {
  const stored = { id: "acidic-corrosive", name: "Acidic / corrosive", restrictiveness: 3 };
  it("takes the common-practice default where the site stored none, and says so", () => {
    expect(effectiveRule({ ...stored, minShare_percent: null, alsoAccepts: null })).toEqual({
      ...stored,
      minShare_percent: 10,
      alsoAccepts: [],
      defaultMinShare: true,
      defaultAlsoAccepts: true,
    });
  });
  it("keeps the site's own values, 0 % and an empty list included", () => {
    expect(effectiveRule({ ...stored, minShare_percent: 0, alsoAccepts: ["aqueous"] })).toMatchObject({
      minShare_percent: 0,
      alsoAccepts: ["aqueous"],
      defaultMinShare: false,
      defaultAlsoAccepts: false,
    });
  });
  it("falls back to 0 % and no other streams for a stream Decant has no default for", () => {
    expect(
      effectiveRule({ id: "site-cytotoxic", name: "Cytotoxic", restrictiveness: 5, minShare_percent: null, alsoAccepts: null }),
    ).toMatchObject({
      minShare_percent: 0,
      alsoAccepts: [],
    });
  });
});

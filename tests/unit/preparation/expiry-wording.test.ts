import { describe, expect, it } from "vitest";
import { labelContentOf } from "../../../src/lib/labels/batch-label";
import {
  batchExpiry,
  DEFAULT_EXPIRY_RULES,
  expiryFromBasis,
  shelfLifeText,
  storageLine,
  type BatchExpiry,
} from "../../../src/lib/preparation/expiry";
import type { BatchDetail } from "../../../src/lib/preparation/types";
import { recipeInputSchema } from "../../../src/lib/schemas/recipes";

const preparedAt = new Date("2026-12-04T01:05:00Z");

/** A batch as getBatch builds it from one expiry computation. */
function batchWith(expiry: BatchExpiry, conditions: string | null): BatchDetail {
  return {
    id: 1,
    code: "B26-1204",
    recipeId: 3,
    recipeCode: "MP-PHOS-30",
    recipeName: "25 mM potassium phosphate, pH 3.0",
    recipeVersion: 1,
    recipeVersionId: 3,
    channel: "A",
    spec: null,
    composition: "Water 100 %",
    storage: storageLine(conditions, expiry.wording),
    storageConditions: conditions,
    expiry: expiry.wording,
    detection_nm: 210,
    volume_mL: 1000,
    remaining_mL: 1000,
    bottles: 1,
    bottleSize_mL: 1000,
    temperature_C: 22,
    measuredPH: 3.01,
    phMeterTemperature_C: 22,
    targetPH: 3,
    preparedAt: preparedAt.toISOString(),
    expiresAt: expiry.expiresAt.toISOString(),
    expiryReason: expiry.reason,
    preparedBy: "Tess Technician",
    status: "ready",
    room: "B2.16",
    expired: false,
    deviations: [],
    deviationReason: null,
    components: [
      {
        reagent: "water",
        name: "Water",
        role: "solvent",
        unit: "mL",
        target: 1000,
        actual: 1000,
        stockLotId: null,
        lotNumber: null,
        assay: null,
      },
    ],
    bottleList: [{ number: 1, status: "ready", discarded_mL: null, undo: null }],
  };
}

describe("one expiry: the label's words and the instant come from batchExpiry", () => {
  it("prints the rule's instant and shelf life, never a second one (aqueous buffer, 48 h: the common-practice default, from memory)", () => {
    const expiry = batchExpiry({ kind: "aqueous-buffer", preparedAt, rules: DEFAULT_EXPIRY_RULES, lots: [] });
    const label = labelContentOf(batchWith(expiry, "2–8 °C"), "UTC");
    expect(expiry.expiresAt.toISOString()).toBe("2026-12-06T01:05:00.000Z");
    expect(label.expires).toBe("2026-12-06 01:05 UTC");
    expect(label.storage).toBe("2–8 °C · shelf life: aqueous buffer without organic, 2 days");
    // The storage line states the same shelf life as the instant: 48 h after preparation.
    expect(label.storage).toContain(shelfLifeText((expiry.expiresAt.getTime() - preparedAt.getTime()) / 3_600_000));
  });

  it("names the lot when a lot's expiry cuts the rule short", () => {
    const expiry = batchExpiry({
      kind: "aqueous-acidified",
      preparedAt,
      rules: DEFAULT_EXPIRY_RULES,
      lots: [{ lotNumber: "FA-2290", expiresOn: "2026-12-05" }],
    });
    const label = labelContentOf(batchWith(expiry, null), "UTC");
    expect(label.expires).toBe("2026-12-06 00:00 UTC");
    expect(label.storage).toBe("Shelf life: lot FA-2290 expires 2026-12-05, before the rule's 7 days");
  });

  it("gives the same instant and words again from the stored basis", () => {
    const rules = DEFAULT_EXPIRY_RULES.map((r) => (r.kind === "neat-organic" ? { ...r, shelfLife_h: 36 } : r));
    const first = batchExpiry({ kind: "neat-organic", preparedAt, rules, lots: [] });
    const again = expiryFromBasis(preparedAt, JSON.parse(JSON.stringify(first.basis)));
    expect(again.expiresAt.getTime()).toBe(first.expiresAt.getTime());
    expect(again.wording).toEqual(first.wording);
    expect(first.wording.shelfLife).toBe("1 day 12 h");
  });

  it.each(["2–8 °C, use within 7 days", "Room temperature, 48 h", "Fridge, 2 weeks"])(
    "refuses a shelf life in the recipe's storage text: %s",
    (storage) => {
      const parsed = recipeInputSchema.safeParse({
        code: "MP-X",
        name: "X",
        storage,
        spec: { solvents: [{ reagent: "water", percent: 100 }] },
      });
      expect(parsed.success).toBe(false);
      expect(JSON.stringify(parsed.error?.issues)).toMatch(/shelf life comes from the expiry rules/);
    },
  );

  it.each(["2–8 °C", "Room temperature, capped", "Flammables cabinet, away from light"])("accepts storage conditions: %s", (storage) => {
    const parsed = recipeInputSchema.safeParse({
      code: "MP-X",
      name: "X",
      storage,
      spec: { solvents: [{ reagent: "water", percent: 100 }] },
    });
    expect(parsed.error?.issues.filter((i) => i.path[0] === "storage") ?? []).toEqual([]);
  });
});

// Flammable liquids on hand per room. Which reagents are flammable is the catalogue's flag:
// acetonitrile and methanol carry H225 (highly flammable liquid and vapour; ECHA C&L inventory,
// harmonised classification), water does not. The "near" mark at 80 % of a room's limit is
// common practice (Decant's example); fire codes and the institution decide the real limits.
import { describe, expect, it } from "vitest";
import { flammableShare, flammablesByRoomFrom, flammableState } from "../../../src/lib/waste/flammables";

describe("flammableShare (v/v of the liquid components)", () => {
  it.each<[string, Parameters<typeof flammableShare>[0], number]>([
    [
      "acetonitrile/water 50:50",
      [
        { reagentId: "acetonitrile", unit: "mL", amount_mL: 500 },
        { reagentId: "water", unit: "mL", amount_mL: 500 },
      ],
      0.5,
    ],
    [
      "methanol/water 10:90, a solid additive left out",
      [
        { reagentId: "methanol", unit: "mL", amount_mL: 100 },
        { reagentId: "water", unit: "mL", amount_mL: 900 },
        { reagentId: "ammonium-formate", unit: "g", amount_mL: 0.63 },
      ],
      0.1,
    ],
    ["water only", [{ reagentId: "water", unit: "mL", amount_mL: 1000 }], 0],
    ["no liquid at all", [{ reagentId: "ammonium-formate", unit: "g", amount_mL: 1 }], 0],
    [
      "a reagent the catalogue lacks takes the reagents table's flag",
      [
        { reagentId: "site-solvent-x", unit: "mL", amount_mL: 250, tableFlammable: true },
        { reagentId: "water", unit: "mL", amount_mL: 750 },
      ],
      0.25,
    ],
  ])("%s", (_, components, share) => {
    expect(flammableShare(components)).toBeCloseTo(share, 10);
  });
});

describe("flammableState against a 100 L room limit", () => {
  it.each<[number, number | null, string]>([
    [79.99, 100, "ok"],
    [80, 100, "near"],
    [99.99, 100, "near"],
    [100, 100, "over"],
    [250, null, "no-limit"],
  ])("%d L → %s", (onHand, limit, state) => {
    expect(flammableState(onHand, limit)).toBe(state);
  });
});

describe("flammablesByRoomFrom", () => {
  it("adds stock, the flammable share of batches and of waste per room, in litres to 2 decimals", () => {
    const rooms = flammablesByRoomFrom(
      {
        stock: [{ room: "B2.14", remaining_mL: 2500 }],
        batches: [
          { room: "B2.14", remaining_mL: 1000, share: 0.5 },
          { room: "B2.16", remaining_mL: 800, share: 0 },
        ],
        containers: [{ room: "B2.16", estimated_mL: 3333, fraction: 1.2 }], // a fraction over 1 counts as 1
      },
      { "B2.14": 3.5, Store: 20 },
    );
    expect(rooms).toEqual([
      { room: "B2.14", stock_L: 2.5, batches_L: 0.5, waste_L: 0, onHand_L: 3, limit_L: 3.5, state: "near" },
      { room: "B2.16", stock_L: 0, batches_L: 0, waste_L: 3.33, onHand_L: 3.33, limit_L: null, state: "no-limit" },
      { room: "Store", stock_L: 0, batches_L: 0, waste_L: 0, onHand_L: 0, limit_L: 20, state: "ok" },
    ]);
  });
});

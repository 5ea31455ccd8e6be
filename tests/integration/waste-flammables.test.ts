// Flammable liquids on hand per room, against a database of its own: the figure is the stock lots,
// the live batches (what is left × their flammable share) and the live waste containers together,
// checked against a sum made here straight from the tables. Batches record the room they are kept
// in, the first known room when the form leaves it out.
import { QueryTypes, type Sequelize } from "sequelize";
import { beforeAll, describe, expect, it } from "vitest";
import { preparationPlan } from "../../src/lib/preparation/plan";
import { knownRooms, recordBatch } from "../../src/lib/server/services/preparation";
import { getRecipeVersion } from "../../src/lib/server/services/recipes";
import { flammablesByRoom } from "../../src/lib/server/services/waste/flammables";
import { actor, useServiceDatabase } from "../support/service-database";

const handle = useServiceDatabase();
let db: Sequelize;
beforeAll(() => {
  db = handle.sequelize;
});
const tech = actor(3, "technician");
const key = () => `flam-${Math.random().toString(36).slice(2, 12)}`;

/** Recipe version 2 of the demo (0.1 % formic acid in acetonitrile), with the first usable lot of each reagent. */
async function acetonitrileBatch(volume_mL: number, room?: string) {
  const version = await getRecipeVersion(2);
  const plan = preparationPlan({ spec: version.spec, volume_mL, temperature_C: 22, detection_nm: version.detection_nm });
  const components = [];
  for (const c of plan.components) {
    const [lot] = await db.query<{ id: number }>(
      "SELECT id FROM stock_lots WHERE reagent_id = ? AND remaining > 0 AND expires_on > CURRENT_DATE ORDER BY remaining DESC LIMIT 1",
      { type: QueryTypes.SELECT, replacements: [c.reagent] },
    );
    components.push({ reagent: c.reagent, stockLotId: lot!.id, actualAmount: c.target }); // recorded "as planned"
  }
  return recordBatch(
    {
      idempotencyKey: key(),
      recipeVersionId: 2,
      volume_mL,
      bottles: 1,
      bottleSize_mL: 1000,
      temperature_C: 22,
      components,
      ...(room ? { room } : {}),
    },
    tech,
  );
}

describe("the room a batch is kept in", () => {
  it("lists the rooms of instruments, stock lots and room limits", async () => {
    expect(await knownRooms()).toEqual(["B2.14", "B2.16"]);
  });

  it("defaults to the first known room and keeps the one chosen", async () => {
    const plain = await acetonitrileBatch(500);
    expect(plain.batch.room).toBe("B2.14");
    const chosen = await acetonitrileBatch(800, "B2.16");
    expect(chosen.batch.room).toBe("B2.16");
    const [row] = await db.query<{ room: string }>("SELECT room FROM batches WHERE id = ?", {
      type: QueryTypes.SELECT,
      replacements: [chosen.batch.id],
    });
    expect(row!.room).toBe("B2.16");
  });

  it("refuses a room Decant does not know, naming the field", async () => {
    await expect(acetonitrileBatch(500, "Z9.99")).rejects.toThrow(/^room: /);
  });

  it("gives the demo batches a room", async () => {
    const [row] = await db.query<{ n: number }>("SELECT COUNT(*) AS n FROM batches WHERE room IS NULL", { type: QueryTypes.SELECT });
    expect(Number(row!.n)).toBe(0);
  });
});

describe("flammables on hand per room", () => {
  it("equals stock lots + live batches + waste, summed straight from the tables", async () => {
    // A discarded batch in B2.16 must not count; add one so the test would see it.
    await db.query(
      "UPDATE batches SET status = 'discarded' WHERE id = (SELECT id FROM (SELECT id FROM batches WHERE room = 'B2.16' AND status IN ('ready','in_use') ORDER BY id DESC LIMIT 1) t)",
    );
    const now = new Date();

    const stock = await db.query<{ room: string; v: string }>(
      `SELECT l.room, SUM(l.remaining) AS v FROM stock_lots l JOIN reagents r ON r.id = l.reagent_id
        WHERE r.flammable = 1 AND r.unit = 'mL' AND l.remaining > 0 GROUP BY l.room`,
      { type: QueryTypes.SELECT },
    );
    const batches = await db.query<{ room: string; v: string }>(
      `SELECT b.room, SUM(b.remaining_ml * f.share) AS v
         FROM batches b
         JOIN (SELECT c.batch_id,
                      SUM(CASE WHEN c.unit = 'mL' AND r.flammable = 1 THEN COALESCE(c.actual_amount, c.target_amount) ELSE 0 END)
                        / NULLIF(SUM(CASE WHEN c.unit = 'mL' THEN COALESCE(c.actual_amount, c.target_amount) ELSE 0 END), 0) AS share
                 FROM batch_components c JOIN reagents r ON r.id = c.reagent_id GROUP BY c.batch_id) f ON f.batch_id = b.id
        WHERE b.status IN ('ready', 'in_use') GROUP BY b.room`,
      { type: QueryTypes.SELECT },
    );
    // Each live container: (last reading of its accumulation, or 0) + the ledger since, times the
    // flammable fraction of everything routed to it in the accumulation.
    const waste = await db.query<{ room: string; v: string }>(
      `SELECT x.room, SUM((x.level + x.added) * x.fraction) AS v FROM (
         SELECT c.room,
                COALESCE((SELECT r.level_ml FROM waste_readings r WHERE r.container_id = c.id AND r.read_at <= :now
                            AND (c.accumulation_started_at IS NULL OR r.read_at >= c.accumulation_started_at) ORDER BY r.read_at DESC, r.id DESC LIMIT 1), 0) AS level,
                COALESCE((SELECT SUM(l.volume_ml) FROM ledger_entries l WHERE l.waste_container_id = c.id AND l.occurred_at <= :now
                            AND (c.accumulation_started_at IS NULL OR l.occurred_at >= c.accumulation_started_at)
                            AND l.occurred_at > COALESCE((SELECT MAX(r.read_at) FROM waste_readings r WHERE r.container_id = c.id AND r.read_at <= :now
                                                          AND (c.accumulation_started_at IS NULL OR r.read_at >= c.accumulation_started_at)), '1000-01-01')), 0) AS added,
                COALESCE((SELECT SUM(CASE WHEN g.flammable = 1 THEN l.volume_ml ELSE 0 END) / NULLIF(SUM(l.volume_ml), 0)
                            FROM ledger_entries l JOIN reagents g ON g.id = l.reagent_id
                           WHERE l.waste_container_id = c.id AND (c.accumulation_started_at IS NULL OR l.occurred_at >= c.accumulation_started_at)), 0) AS fraction
           FROM waste_containers c WHERE c.status <> 'collected') x
        GROUP BY x.room`,
      { type: QueryTypes.SELECT, replacements: { now } },
    );
    const litres = (rows: { room: string; v: string }[], room: string) => Number(rows.find((r) => r.room === room)?.v ?? 0) / 1000;

    const figures = await flammablesByRoom(now);
    expect(figures.map((f) => f.room)).toEqual(["B2.14", "B2.16"]);
    for (const f of figures) {
      const lots = litres(stock, f.room);
      const live = litres(batches, f.room);
      const inWaste = litres(waste, f.room);
      expect(Math.abs(f.stock_L - lots)).toBeLessThanOrEqual(0.006);
      expect(Math.abs(f.batches_L - live)).toBeLessThanOrEqual(0.006);
      expect(Math.abs(f.waste_L - inWaste)).toBeLessThanOrEqual(0.006);
      expect(Math.abs(f.onHand_L - (lots + live + inWaste))).toBeLessThanOrEqual(0.006);
    }
    // The demo keeps an acetonitrile mix in B2.16 (2.89 L left) and the test added 0.8 L, then discarded one.
    const b216 = figures.find((f) => f.room === "B2.16")!;
    expect(b216.batches_L).toBeGreaterThan(2.5);
    expect(b216.limit_L).toBe(25);
  });

  it("counts a batch's flammable share only: more of a water-based batch adds nothing", async () => {
    const before = await flammablesByRoom();
    // Batch 4 is 0.1 % formic acid in water (neither flammable in the catalogue).
    await db.query("UPDATE batches SET remaining_ml = remaining_ml + 1000 WHERE id = 4 AND status IN ('ready', 'in_use')");
    const after = await flammablesByRoom();
    expect(after.map((f) => f.batches_L)).toEqual(before.map((f) => f.batches_L));
    // …while more of the acetonitrile mix adds its litre.
    await db.query("UPDATE batches SET remaining_ml = remaining_ml + 1000 WHERE id = 5");
    const more = await flammablesByRoom();
    expect(more.find((f) => f.room === "B2.16")!.batches_L - after.find((f) => f.room === "B2.16")!.batches_L).toBeCloseTo(1, 2);
  });
});

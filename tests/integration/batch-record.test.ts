// A batch record a technician can trust: the demo batches hold together, a discarded bottle can be
// taken back within the undo window by a reversing entry, and blank or implausible actuals are refused.
import { QueryTypes } from "sequelize";
import { describe, expect, it } from "vitest";
import { batchCodeBase } from "../../src/lib/preparation/batch-code";
import { expiryFromBasis, lotEndOfLife, SHELF_LIFE_IN_TEXT, type ExpiryBasis } from "../../src/lib/preparation/expiry";
import { batchCreateSchema } from "../../src/lib/schemas/preparation";
import { HttpError } from "../../src/lib/server/http";
import { getBatch } from "../../src/lib/server/services/batches";
import { undoBottle, updateBottle } from "../../src/lib/server/services/bottles";
import { recordBatch } from "../../src/lib/server/services/preparation";
import { actor, useServiceDatabase } from "../support/service-database";

const db = useServiceDatabase();
const tech = actor(3, "technician");
const q = <T extends object>(sql: string, replacements: unknown[] = []) =>
  db.sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });

async function refusal(promise: Promise<unknown>): Promise<HttpError> {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(HttpError);
  return error as HttpError;
}

describe("the demo batches hold together", () => {
  it("code and preparation day agree, and every batch has a row per bottle", async () => {
    const rows = await q<{ id: number; code: string; prepared_at: Date; bottles: number; rows: number }>(
      "SELECT b.id, b.code, b.prepared_at, b.bottles, (SELECT COUNT(*) FROM batch_bottles x WHERE x.batch_id = b.id) AS `rows` FROM batches b",
    );
    expect(rows.length).toBeGreaterThan(6);
    for (const b of rows) {
      expect(b.code.startsWith(batchCodeBase(new Date(b.prepared_at))), `${b.code} made ${new Date(b.prepared_at).toISOString()}`).toBe(
        true,
      );
      expect(Number(b.rows), `${b.code} bottles`).toBe(Number(b.bottles));
    }
  });

  it("no batch took from a lot that had expired on the day it was made", async () => {
    const rows = await q<{ code: string; prepared_at: Date; lot_number: string; expires_on: string }>(
      `SELECT b.code, b.prepared_at, l.lot_number, l.expires_on FROM batch_components c
         JOIN batches b ON b.id = c.batch_id JOIN stock_lots l ON l.id = c.stock_lot_id`,
    );
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows)
      expect(lotEndOfLife(String(r.expires_on).slice(0, 10)) > new Date(r.prepared_at), `${r.code} with ${r.lot_number}`).toBe(true);
  });

  it("every expiry is the one the rule computes, and no recipe states a second shelf life", async () => {
    const rows = await q<{ code: string; prepared_at: Date; expires_at: Date; expiry_basis: unknown }>(
      "SELECT code, prepared_at, expires_at, expiry_basis FROM batches",
    );
    for (const r of rows) {
      const basis = (typeof r.expiry_basis === "string" ? JSON.parse(r.expiry_basis) : r.expiry_basis) as ExpiryBasis | null;
      expect(basis, r.code).not.toBeNull();
      expect(expiryFromBasis(new Date(r.prepared_at), basis!).expiresAt.getTime(), r.code).toBe(new Date(r.expires_at).getTime());
    }
    for (const { storage } of await q<{ storage: string | null }>("SELECT storage FROM recipe_versions"))
      expect(SHELF_LIFE_IN_TEXT.test(storage ?? ""), storage ?? "").toBe(false);
  });
});

describe("discarding a bottle, and taking it back", () => {
  it("reverses the discard entries with correction entries inside the window, once", async () => {
    const before = await getBatch(4);
    const open = before.bottleList.find((b) => b.status === "ready" || b.status === "in_use")!;
    const after = await updateBottle(4, open.number, { status: "discarded", discarded_mL: 300 }, tech);
    expect(after.remaining_mL).toBeCloseTo(before.remaining_mL - 300, 4);
    expect(after.bottleList.find((b) => b.number === open.number)!.undo).toMatchObject({ effect: expect.stringMatching(/300 mL back/) });

    const undone = await undoBottle(4, open.number, tech);
    expect(undone.remaining_mL).toBeCloseTo(before.remaining_mL, 4);
    expect(undone.bottleList.find((b) => b.number === open.number)!.status).toBe(open.status);
    const entries = await q<{ kind: string; volume_ml: number; reverses_id: number | null }>(
      "SELECT kind, volume_ml, reverses_id FROM ledger_entries WHERE source_id = ? ORDER BY id",
      [`bottle:4:${open.number}`],
    );
    // The discard stays in the ledger; each of its entries has a correction of the opposite sign.
    const discards = entries.filter((e) => e.kind === "discard");
    const corrections = entries.filter((e) => e.kind === "correction");
    expect(discards.length).toBeGreaterThan(0);
    expect(corrections).toHaveLength(discards.length);
    expect(corrections.reduce((a, e) => a + Number(e.volume_ml), 0)).toBeCloseTo(-300, 4);

    expect((await refusal(undoBottle(4, open.number, tech))).message).toMatch(/^undo: bottle \d+ has nothing to undo/);
  });

  it("refuses the undo once the window has passed", async () => {
    const batch = await getBatch(4);
    const open = batch.bottleList.find((b) => b.status === "ready" || b.status === "in_use")!;
    await updateBottle(4, open.number, { status: "empty" }, tech);
    await db.sequelize.query("UPDATE batch_bottles SET changed_at = NOW(3) - INTERVAL 3 MINUTE WHERE batch_id = 4 AND number = ?", {
      replacements: [open.number],
    });
    expect((await getBatch(4)).bottleList.find((b) => b.number === open.number)!.undo).toBeNull();
    expect((await refusal(undoBottle(4, open.number, tech))).message).toMatch(/can be undone only within 2 minutes/);
  });
});

describe("actuals are recorded, not assumed", () => {
  const input = (actual: number | null) =>
    batchCreateSchema.parse({
      idempotencyKey: `actuals-${Math.random().toString(36).slice(2, 10)}`,
      recipeVersionId: 2,
      volume_mL: 1000,
      bottles: 1,
      bottleSize_mL: 1000,
      components: [
        { reagent: "acetonitrile", stockLotId: 1, actualAmount: 999 },
        { reagent: "formic-acid", stockLotId: 3, actualAmount: actual },
      ],
    });

  it.each<[string, number | null, RegExp]>([
    ["blank", null, /^components\.1\.actualAmount: Record the formic acid actually used, or press "As planned"/],
    ["ten times the target", 10, /^components\.1\.actualAmount: 10\.0 mL is 10× the target 1\.00 mL/],
  ])("refuses a %s actual, naming the field", async (_, actual, pattern) => {
    const error = await refusal(recordBatch(input(actual), tech));
    expect(error.status).toBe(400);
    expect(error.message).toMatch(pattern);
    expect(Object.keys((error.details as { fields: object }).fields)).toEqual(["components.1.actualAmount"]);
  });

  it("records the batch once the actual is given, 1000 mL in the bottle", async () => {
    const { batch } = await recordBatch(input(1.0), tech);
    expect(batch.volume_mL).toBe(1000);
    expect(batch.components.find((c) => c.reagent === "acetonitrile")!.target).toBeCloseTo(999, 6);
    expect(batch.expiry.basis).toMatch(/neat organic/i);
    expect(batch.storage).toMatch(/shelf life: neat organic .*30 days/i);
  });
});

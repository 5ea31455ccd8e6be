// Keys recorded before withIdempotencyKey existed (migration 2026.12.04T02.00.00.idempotency-key-scope):
// the database is taken back to the old schema, given keys the way the old code left them, and
// migrated again. A repeated submit of any of them must answer what was recorded, not record again,
// and a claim that a failed attempt left behind must not block the retry.
import { beforeAll, describe, expect, it, vi } from "vitest";
import { migrator } from "../../src/db/umzug";
import { withIdempotencyKey } from "../../src/lib/server/idempotency";
import { execute, selectOne } from "../../src/lib/server/query";
import { useServiceDatabase } from "../support/service-database";

const db = useServiceDatabase();
const MIGRATION = "2026.12.04T02.00.00.idempotency-key-scope.ts";
const draw = { batchCode: "B26-1103", volume_mL: 12.5, remaining_mL: 3000, entries: 2, replayed: false };
let batchId = 0;
let runId = 0;

beforeAll(async () => {
  await migrator(db.sequelize).down({ to: MIGRATION });
  batchId = (await selectOne<{ id: number }>("SELECT MIN(id) AS id FROM batches"))!.id;
  runId = (await selectOne<{ id: number }>("SELECT MIN(id) AS id FROM runs"))!.id;
  // As the old code left them: a batch's claim without an answer (the batch row holds the key),
  // a claim whose batch was never written, a draw's stored result, and a run keyed on its own row.
  await execute("UPDATE batches SET idempotency_key = 'old-batch-key' WHERE id = ?", { replacements: [batchId] });
  await execute("UPDATE runs SET idempotency_key = 'old-run-key' WHERE id = ?", { replacements: [runId] });
  await execute(
    "INSERT INTO idempotency_keys (`key`, scope, response, created_at) VALUES ('old-batch-key', 'batch', NULL, NOW(3)), ('old-stale-claim', 'batch', NULL, NOW(3)), ('old-draw-key', 'draw', ?, NOW(3))",
    { replacements: [JSON.stringify(draw)] },
  );
  await migrator(db.sequelize).up();
});

describe("keys recorded before the one mechanism", () => {
  it.each([
    ["a batch", "batch", "old-batch-key", () => batchId],
    ["a run", "run", "old-run-key", () => runId],
    ["a draw", "draw", "old-draw-key", () => draw],
  ])("%s submitted again gets what was recorded, and nothing runs", async (_what, scope, key, expected) => {
    const work = vi.fn(async () => "recorded again");
    expect(await withIdempotencyKey(scope, key, work)).toEqual({ value: expected(), replayed: true });
    expect(work).not.toHaveBeenCalled();
  });

  it("lets the retry of a claim that a failed attempt left behind do the work", async () => {
    expect(await withIdempotencyKey("batch", "old-stale-claim", async () => "recorded now")).toEqual({
      value: "recorded now",
      replayed: false,
    });
  });
});

// withIdempotencyKey (src/lib/server/idempotency.ts): what batches, runs and draws rely on when
// the same submission arrives more than once. The work writes a row of a probe table, so "the work
// ran" is what the database holds, not what the test counted.
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { getSequelize } from "../../src/lib/server/db";
import { withIdempotencyKey } from "../../src/lib/server/idempotency";
import { execute, select } from "../../src/lib/server/query";
import { useServiceDatabase } from "../support/service-database";

useServiceDatabase();

let n = 0;
const freshKey = () => `probe-key-${++n}-${Math.random().toString(36).slice(2, 8)}`;

/** A promise and the function that resolves it. */
function signal() {
  let resolve!: () => void;
  const promise = new Promise<void>((r) => (resolve = r));
  return { promise, resolve };
}

/** The work of a submission: one probe row, answered with its id and a nested object. */
const record = (key: string, note: string) => async (transaction: Parameters<Parameters<typeof withIdempotencyKey>[2]>[0]) => {
  const { insertId } = await execute("INSERT INTO idem_probe (k, note) VALUES (?, ?)", { replacements: [key, note], transaction });
  return { probeId: insertId, note, detail: { channels: ["A", "B"], volume_mL: 12.5 } };
};
const probes = (key: string) =>
  select<{ id: number; note: string }>("SELECT id, note FROM idem_probe WHERE k = ? ORDER BY id", { replacements: [key] });

beforeAll(async () => {
  await execute(
    "CREATE TABLE idem_probe (id INT AUTO_INCREMENT PRIMARY KEY, k VARCHAR(80) NOT NULL, note VARCHAR(80) NOT NULL) ENGINE=InnoDB",
  );
});

describe("withIdempotencyKey", () => {
  it("runs the work once for twenty submissions at once, and answers each of them with its result", async () => {
    const key = freshKey();
    const outcomes = await Promise.all(
      Array.from({ length: 20 }, (_, i) => withIdempotencyKey("probe", key, record(key, `submission ${i}`))),
    );
    const rows = await probes(key);
    expect(rows).toHaveLength(1);
    expect(outcomes.filter((o) => !o.replayed)).toHaveLength(1);
    for (const o of outcomes)
      expect(o.value).toEqual({ probeId: rows[0]!.id, note: rows[0]!.note, detail: { channels: ["A", "B"], volume_mL: 12.5 } });
  });

  it("answers a later submission with the stored result without running the work", async () => {
    const key = freshKey();
    const first = await withIdempotencyKey("probe", key, record(key, "first"));
    const work = vi.fn(record(key, "second"));
    const again = await withIdempotencyKey("probe", key, work);
    expect(again).toEqual({ value: first.value, replayed: true });
    expect(work).not.toHaveBeenCalled();
    expect(await probes(key)).toHaveLength(1);
  });

  it("leaves nothing of a failed attempt behind, so a retry does the work", async () => {
    const key = freshKey();
    const failing = async (transaction: Parameters<ReturnType<typeof record>>[0]) => {
      await record(key, "failed")(transaction);
      throw new Error("the batch is used up");
    };
    await expect(withIdempotencyKey("probe", key, failing)).rejects.toThrow("the batch is used up");
    expect(await probes(key)).toEqual([]);
    const retry = await withIdempotencyKey("probe", key, record(key, "retry"));
    expect(retry.replayed).toBe(false);
    expect((await probes(key)).map((r) => r.note)).toEqual(["retry"]);
  });

  it("lets a submission that waited on a failing first attempt do the work itself", async () => {
    const key = freshKey();
    const firstInside = signal();
    const firstMayFail = signal();
    let secondRanBeforeFirstFailed: boolean | null = null;
    let firstFailed = false;
    const first = withIdempotencyKey("probe", key, async (transaction) => {
      await record(key, "first")(transaction);
      firstInside.resolve();
      await firstMayFail.promise;
      firstFailed = true;
      throw new Error("first attempt failed");
    });
    await firstInside.promise;
    const second = withIdempotencyKey("probe", key, async (transaction) => {
      secondRanBeforeFirstFailed = !firstFailed;
      return record(key, "second")(transaction);
    });
    // Give the second time to reach the database and wait there on the first one's key.
    await new Promise((resolve) => setTimeout(resolve, 300));
    firstMayFail.resolve();
    await expect(first).rejects.toThrow("first attempt failed");
    const outcome = await second;
    expect(secondRanBeforeFirstFailed).toBe(false);
    expect(outcome.replayed).toBe(false);
    expect((await probes(key)).map((r) => r.note)).toEqual(["second"]);
  });

  describe("with a second app instance (its own modules and connection pool)", () => {
    let other: typeof import("../../src/lib/server/idempotency");
    let otherDb: typeof import("../../src/lib/server/db");
    beforeAll(async () => {
      vi.resetModules();
      otherDb = await import("../../src/lib/server/db");
      other = await import("../../src/lib/server/idempotency");
      expect(otherDb.getSequelize()).not.toBe(getSequelize());
    });
    afterAll(async () => {
      await otherDb.getSequelize().close();
    });

    it("makes the other instance wait while this one works, then answers it with this one's result", async () => {
      const key = freshKey();
      const inside = signal();
      const mayCommit = signal();
      const here = withIdempotencyKey("probe", key, async (transaction) => {
        const value = await record(key, "here")(transaction);
        inside.resolve();
        await mayCommit.promise;
        return value;
      });
      await inside.promise;
      const work = vi.fn(record(key, "there"));
      let thereDone = false;
      const there = other.withIdempotencyKey("probe", key, work).finally(() => (thereDone = true));
      await new Promise((resolve) => setTimeout(resolve, 300));
      expect(thereDone).toBe(false);
      mayCommit.resolve();
      const [a, b] = await Promise.all([here, there]);
      expect(a.replayed).toBe(false);
      expect(b).toEqual({ value: a.value, replayed: true });
      expect(work).not.toHaveBeenCalled();
      expect((await probes(key)).map((r) => r.note)).toEqual(["here"]);
    });
  });

  it("keeps scopes apart: the same key in two scopes is two submissions", async () => {
    const key = freshKey();
    const [a, b] = await Promise.all([
      withIdempotencyKey("batch", key, record(key, "batch")),
      withIdempotencyKey("run", key, record(key, "run")),
    ]);
    expect([a.replayed, b.replayed]).toEqual([false, false]);
    expect((await probes(key)).map((r) => r.note).sort()).toEqual(["batch", "run"]);
  });

  it("reads back any JSON value the work returned: a bare string, a number, nothing", async () => {
    for (const value of ["just text", "[1,2]", 42, null]) {
      const key = freshKey();
      await withIdempotencyKey("probe", key, async () => value);
      expect(await withIdempotencyKey("probe", key, async () => "other")).toEqual({ value, replayed: true });
    }
  });
});

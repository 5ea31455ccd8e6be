// Two requests that lock the same rows in opposite order deadlock; MariaDB rolls one back. The
// services' transactions are tried again, so neither request fails with a 500.
import { QueryTypes } from "sequelize";
import { describe, expect, it } from "vitest";
import { inTransaction, isDeadlock } from "../../src/lib/server/services/sql";
import { useTestDatabase } from "../support/database";

const db = useTestDatabase({ seed: false });

/** A promise and the function that resolves it. */
function signal() {
  let resolve!: () => void;
  const promise = new Promise<void>((r) => (resolve = r));
  return { promise, resolve };
}

describe("inTransaction", () => {
  it("tries a transaction that lost a deadlock again, and both writes land once", async () => {
    await db.sequelize.query("CREATE TABLE lock_probe (id INT PRIMARY KEY, n INT NOT NULL) ENGINE=InnoDB");
    await db.sequelize.query("INSERT INTO lock_probe VALUES (1, 0), (2, 0)");
    const firstHeld = signal();
    const secondHeld = signal();
    const attempts = { first: 0, second: 0 };
    const errors: unknown[] = [];

    // Each takes its own row, waits until the other holds its row, then reaches for the other's.
    const update = (
      which: "first" | "second",
      own: number,
      other: number,
      held: ReturnType<typeof signal>,
      otherHeld: ReturnType<typeof signal>,
    ) =>
      inTransaction(db.sequelize, async (transaction) => {
        attempts[which]++;
        await db.sequelize.query("UPDATE lock_probe SET n = n + 1 WHERE id = ?", { replacements: [own], transaction });
        if (attempts[which] === 1) {
          held.resolve();
          await otherHeld.promise;
        }
        try {
          await db.sequelize.query("UPDATE lock_probe SET n = n + 1 WHERE id = ?", { replacements: [other], transaction });
        } catch (error) {
          errors.push(error);
          throw error;
        }
      });

    await Promise.all([update("first", 1, 2, firstHeld, secondHeld), update("second", 2, 1, secondHeld, firstHeld)]);

    // One of the two met the deadlock and was run a second time; the other went through once.
    expect(errors).toHaveLength(1);
    expect(isDeadlock(errors[0])).toBe(true);
    expect(attempts.first + attempts.second).toBe(3);
    // Each transaction added 1 to both rows, and the rolled-back attempt added nothing.
    const rows = await db.sequelize.query<{ id: number; n: number }>("SELECT id, n FROM lock_probe ORDER BY id", {
      type: QueryTypes.SELECT,
    });
    expect(rows.map((r) => r.n)).toEqual([2, 2]);
  });

  it("does not try again after any other error, and leaves nothing written", async () => {
    await db.sequelize.query("CREATE TABLE once_probe (id INT PRIMARY KEY) ENGINE=InnoDB");
    let attempts = 0;
    await expect(
      inTransaction(db.sequelize, async (transaction) => {
        attempts++;
        await db.sequelize.query("INSERT INTO once_probe VALUES (1)", { transaction });
        await db.sequelize.query("INSERT INTO once_probe VALUES (1)", { transaction });
      }),
    ).rejects.toThrow(/Duplicate entry|Validation error/);
    expect(attempts).toBe(1);
    const [{ n }] = (await db.sequelize.query<{ n: number }>("SELECT COUNT(*) AS n FROM once_probe", { type: QueryTypes.SELECT })) as [
      { n: number },
    ];
    expect(Number(n)).toBe(0);
  });
});

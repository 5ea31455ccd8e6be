// The query edge (src/lib/server/query.ts): every service's raw SQL goes through it, so what it
// promises holds everywhere: numbers for DECIMAL columns, the transaction honoured, writes counted.
import { describe, expect, it } from "vitest";
import { Batch } from "../../src/lib/server/models/preparation";
import { execute, select, selectOne } from "../../src/lib/server/query";
import { inTransaction } from "../../src/lib/server/services/sql";
import { useServiceDatabase } from "../support/service-database";

const db = useServiceDatabase();

describe("the query edge", () => {
  it("hands DECIMAL columns and sums over them to callers as numbers, in raw and model reads alike", async () => {
    const row = await selectOne<{ v: number; total: number }>(
      "SELECT CAST(12.345 AS DECIMAL(8,3)) AS v, SUM(remaining_ml) AS total FROM batches",
    );
    expect(row?.v).toBe(12.345);
    expect(typeof row?.total).toBe("number");
    const batch = await Batch.findOne({ order: [["id", "ASC"]] });
    expect(typeof batch?.remainingMl).toBe("number");
    expect(typeof batch?.volumeMl).toBe("number");
  });

  it("binds named and positional values, never text built into the SQL", async () => {
    const named = await select<{ s: string }>("SELECT :text AS s", { replacements: { text: "x'); DROP TABLE batches; --" } });
    const positional = await select<{ n: number }>("SELECT ? + 1 AS n", { replacements: [41] });
    expect(named).toEqual([{ s: "x'); DROP TABLE batches; --" }]);
    expect(Number(positional[0]?.n)).toBe(42);
    expect(await selectOne("SELECT 1 AS one FROM batches WHERE id < 0")).toBeUndefined();
  });

  it("counts the rows a write touched, gives the new id, and writes inside the caller's transaction", async () => {
    await execute("CREATE TABLE edge_probe (id INT AUTO_INCREMENT PRIMARY KEY, n INT NOT NULL) ENGINE=InnoDB");
    const inserted = await execute("INSERT INTO edge_probe (n) VALUES (1), (2), (3)");
    expect(inserted).toEqual({ affectedRows: 3, insertId: 1 });
    expect((await execute("UPDATE edge_probe SET n = n + 10 WHERE n >= 2")).affectedRows).toBe(2);
    expect((await execute("DELETE FROM edge_probe WHERE n = ?", { replacements: [12] })).affectedRows).toBe(1);

    await expect(
      inTransaction(db.sequelize, async (transaction) => {
        await execute("INSERT INTO edge_probe (n) VALUES (99)", { transaction });
        const seen = await select<{ n: number }>("SELECT n FROM edge_probe WHERE n = 99", { transaction });
        expect(seen).toHaveLength(1);
        throw new Error("roll back");
      }),
    ).rejects.toThrow("roll back");
    expect(await select("SELECT n FROM edge_probe WHERE n = 99")).toEqual([]);
  });
});

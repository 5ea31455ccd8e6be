import { describe, expect, it } from "vitest";
import { createSequelize, databaseIsUp } from "../../src/lib/server/db";
import { testEnv } from "../support/database";
import { BASE_URL } from "../support/http";

describe("GET /api/health", () => {
  it("answers ok with the database up", async () => {
    const response = await fetch(`${BASE_URL}/api/health`);
    expect(response.status).toBe(200);
    expect(await response.json()).toEqual({ ok: true, db: "up" });
  });

  it("reports the database down when it cannot be reached", async () => {
    // Port 9 (discard) has no MariaDB behind it.
    const unreachable = createSequelize({ ...testEnv(), DATABASE_PORT: 9 });
    expect(await databaseIsUp(unreachable)).toBe(false);
    await unreachable.close();
  });
});

describe("the ledger is append-only", () => {
  it("refuses to update or delete an entry, even through raw SQL", async () => {
    const sequelize = createSequelize(testEnv());
    await expect(sequelize.query("UPDATE ledger_entries SET volume_ml = 0 LIMIT 1")).rejects.toThrow(/append-only/);
    await expect(sequelize.query("DELETE FROM ledger_entries LIMIT 1")).rejects.toThrow(/append-only/);
    await sequelize.close();
  });
});

// The database lifecycle that `npm start` relies on, on a throwaway private server of its own.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { QueryTypes } from "sequelize";
import { afterAll, describe, expect, it } from "vitest";
// A plain ESM script of Node built-ins, shared with scripts/start.mjs.
import { ensureAppUser, startMariadb } from "../../scripts/lib/mariadb.mjs";
import { MIGRATIONS, SEEDERS, migrator, seeder } from "../../src/db/umzug";
import { createSequelize } from "../../src/lib/server/db";
import { freePort } from "../support/ports";

const dataDir = mkdtempSync(join(tmpdir(), "decant-lifecycle-"));
// Whatever the assertions say, the throwaway server must not outlive the test.
let running: { stop(): Promise<void> } | null = null;
afterAll(async () => {
  await running?.stop();
  rmSync(dataDir, { recursive: true, force: true });
});

describe("private database lifecycle", () => {
  it("starts, migrates, seeds, stops, and finds everything again on the next start", async () => {
    const port = await freePort();
    const credentials = { database: "decant_lifecycle", user: "decant", password: "lifecycle-pass-1" };
    const env = {
      DATABASE_HOST: "127.0.0.1",
      DATABASE_PORT: port,
      DATABASE_NAME: credentials.database,
      DATABASE_USER: credentials.user,
      DATABASE_PASSWORD: credentials.password,
    };

    let server = await startMariadb({ dataDir, port });
    running = server;
    ensureAppUser(server, credentials);
    let sequelize = createSequelize(env);
    expect((await migrator(sequelize).up()).length).toBe(Object.keys(MIGRATIONS).length);
    expect((await seeder(sequelize).up()).length).toBe(Object.keys(SEEDERS).length);
    // A change the user made must survive the restart and must not be overwritten by seeding again.
    await sequelize.query("UPDATE projects SET name = 'Renamed by the user' WHERE code = 'PMG-ROOT-26'", { type: QueryTypes.UPDATE });
    const [{ n: ledgerRows }] = (await sequelize.query<{ n: number }>("SELECT COUNT(*) AS n FROM ledger_entries", {
      type: QueryTypes.SELECT,
    })) as [{ n: number }];
    await sequelize.close();
    await server.stop();

    server = await startMariadb({ dataDir, port });
    running = server;
    sequelize = createSequelize(env);
    expect(await migrator(sequelize).up()).toEqual([]);
    expect(await seeder(sequelize).up()).toEqual([]);
    const [project] = await sequelize.query<{ name: string }>("SELECT name FROM projects WHERE code = 'PMG-ROOT-26'", {
      type: QueryTypes.SELECT,
    });
    expect(project?.name).toBe("Renamed by the user");
    const [{ n: ledgerAfter }] = (await sequelize.query<{ n: number }>("SELECT COUNT(*) AS n FROM ledger_entries", {
      type: QueryTypes.SELECT,
    })) as [{ n: number }];
    expect(Number(ledgerAfter)).toBe(Number(ledgerRows));
    expect(Number(ledgerRows)).toBeGreaterThan(100);
    await sequelize.close();
    await server.stop();
  }, 180_000);
});

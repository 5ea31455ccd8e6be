// Each test file gets a database of its own on the private test server, migrated and seeded afresh.
import type { Sequelize } from "sequelize";
import { afterAll, beforeAll } from "vitest";
import { migrator, seeder } from "../../src/db/umzug";
import { createSequelize } from "../../src/lib/server/db";
import { parseEnv } from "../../src/lib/server/env";

export function testEnv() {
  if (!process.env.DATABASE_NAME) throw new Error("Run the integration tests through `npm test`, which starts the test database.");
  return parseEnv(process.env);
}

/**
 * Creates `<prefix>_<worker>_<random>` before the file's tests, opens it with `open`, migrates it
 * (and seeds the demo data when `seed`), and drops it after them.
 */
export function useFileDatabase(prefix: string, open: (name: string) => Sequelize, seed: boolean) {
  const handle: { sequelize: Sequelize; name: string } = {} as never;
  beforeAll(async () => {
    const name = `${prefix}_${process.env.VITEST_POOL_ID ?? "0"}_${Math.random().toString(36).slice(2, 8)}`;
    const admin = createSequelize(testEnv());
    await admin.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    await admin.close();
    handle.name = name;
    handle.sequelize = open(name);
    await migrator(handle.sequelize).up();
    if (seed) await seeder(handle.sequelize).up();
  });
  afterAll(async () => {
    await handle.sequelize.query(`DROP DATABASE \`${handle.name}\``);
    await handle.sequelize.close();
  });
  return handle;
}

/** A database of the file's own on a connection of its own (the demo data unless `seed: false`). */
export function useTestDatabase(options: { seed?: boolean } = {}) {
  return useFileDatabase("decant_test", (name) => createSequelize({ ...testEnv(), DATABASE_NAME: name }), options.seed !== false);
}

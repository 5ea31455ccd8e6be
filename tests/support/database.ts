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

/** Creates `decant_test_<worker>_<n>` with the schema (and the demo data unless `seed: false`). */
export function useTestDatabase(options: { seed?: boolean } = {}) {
  const handle: { sequelize: Sequelize; name: string } = {} as never;
  beforeAll(async () => {
    const env = testEnv();
    const name = `decant_test_${process.env.VITEST_POOL_ID ?? "0"}_${Math.random().toString(36).slice(2, 8)}`;
    const admin = createSequelize(env);
    await admin.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    await admin.close();
    handle.name = name;
    handle.sequelize = createSequelize({ ...env, DATABASE_NAME: name });
    await migrator(handle.sequelize).up();
    if (options.seed !== false) await seeder(handle.sequelize).up();
  });
  afterAll(async () => {
    await handle.sequelize.query(`DROP DATABASE \`${handle.name}\``);
    await handle.sequelize.close();
  });
  return handle;
}

// For tests that call services directly: a database of the file's own, migrated and seeded, made
// the process's database before any service opens a connection (services use getSequelize()).
import type { Sequelize } from "sequelize";
import { afterAll, beforeAll } from "vitest";
import { migrator, seeder } from "../../src/db/umzug";
import { createSequelize, getSequelize } from "../../src/lib/server/db";
import type { SignedInUser } from "../../src/lib/server/guard";
import type { Role } from "../../src/lib/permissions";
import { testEnv } from "./database";

export function useServiceDatabase() {
  const handle: { sequelize: Sequelize; name: string } = {} as never;
  beforeAll(async () => {
    const env = testEnv();
    const name = `decant_test_svc_${process.env.VITEST_POOL_ID ?? "0"}_${Math.random().toString(36).slice(2, 8)}`;
    const admin = createSequelize(env);
    await admin.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    await admin.close();
    process.env.DATABASE_NAME = name;
    handle.name = name;
    handle.sequelize = getSequelize();
    if (handle.sequelize.getDatabaseName() !== name) throw new Error("getSequelize() was opened before useServiceDatabase(); call it first in the file");
    await migrator(handle.sequelize).up();
    await seeder(handle.sequelize).up();
  });
  afterAll(async () => {
    await handle.sequelize.query(`DROP DATABASE \`${handle.name}\``);
    await handle.sequelize.close();
  });
  return handle;
}

/** A signed-in user as the guard hands it to services (ids from the demo seeder). */
export function actor(id: number, role: Role, clientId: number | null = null): SignedInUser {
  return { id, email: `user${id}@demo.test`, name: `User ${id}`, role, clientId } as unknown as SignedInUser;
}

// For tests that call services directly: a database of the file's own, migrated and seeded, made
// the process's database before any service opens a connection (services use getSequelize()).
import { getSequelize } from "../../src/lib/server/db";
import type { SignedInUser } from "../../src/lib/server/guard";
import type { Role } from "../../src/lib/permissions";
import { useFileDatabase } from "./database";

export function useServiceDatabase() {
  return useFileDatabase(
    "decant_test_svc",
    (name) => {
      process.env.DATABASE_NAME = name;
      const sequelize = getSequelize();
      if (sequelize.getDatabaseName() !== name)
        throw new Error("getSequelize() was opened before useServiceDatabase(); call it first in the file");
      return sequelize;
    },
    true,
  );
}

/** A signed-in user as the guard hands it to services (ids from the demo seeder). */
export function actor(id: number, role: Role, clientId: number | null = null): SignedInUser {
  return { id, email: `user${id}@demo.test`, name: `User ${id}`, role, clientId } as unknown as SignedInUser;
}

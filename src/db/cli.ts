// Database lifecycle for scripts/: `tsx src/db/cli.ts migrate|seed|setup|reset`.
import { createSequelize } from "../lib/server/db";
import { EnvError, parseEnv } from "../lib/server/env";
import { migrator, seeder } from "./umzug";

const command = process.argv[2] ?? "setup";
// The development profile passes --demo-year: its demo data gets a year of history (DEV_SEEDERS).
const year = process.argv.includes("--demo-year");

async function main() {
  const sequelize = createSequelize(parseEnv(process.env));
  try {
    if (command === "reset") {
      // Drops everything, the append-only ledger and the migration records included.
      await sequelize.query("SET FOREIGN_KEY_CHECKS = 0");
      await sequelize.getQueryInterface().dropAllTables();
      await sequelize.query("SET FOREIGN_KEY_CHECKS = 1");
    }
    if (["migrate", "setup", "reset"].includes(command)) {
      const done = await migrator(sequelize).up();
      console.log(`decant: schema up to date (${done.length} migration${done.length === 1 ? "" : "s"} applied)`);
    }
    if (["seed", "setup", "reset"].includes(command)) {
      const done = await seeder(sequelize, { year }).up();
      console.log(
        done.length
          ? `decant: demo data loaded (${done.map((s) => s.name).join(", ")})`
          : "decant: demo data already present; kept as it is",
      );
    }
  } finally {
    await sequelize.close();
  }
}

main().catch((error: unknown) => {
  console.error(
    `decant: ${error instanceof EnvError ? error.message : error instanceof Error ? (error.stack ?? error.message) : String(error)}`,
  );
  process.exit(1);
});

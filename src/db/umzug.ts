import { fileURLToPath } from "node:url";
import type { QueryInterface, Sequelize } from "sequelize";
import { SequelizeStorage, Umzug } from "umzug";

const here = fileURLToPath(new URL(".", import.meta.url));

function umzugFor(sequelize: Sequelize, folder: "migrations" | "seeders") {
  return new Umzug<QueryInterface>({
    migrations: { glob: [`${folder}/*.ts`, { cwd: here }] },
    context: sequelize.getQueryInterface(),
    // Seeders are tracked like migrations, so the demo data is loaded once and a restart keeps user changes.
    storage: new SequelizeStorage({ sequelize, tableName: folder === "migrations" ? "schema_migrations" : "schema_seeders" }),
    logger: undefined,
  });
}

export const migrator = (sequelize: Sequelize) => umzugFor(sequelize, "migrations");
export const seeder = (sequelize: Sequelize) => umzugFor(sequelize, "seeders");

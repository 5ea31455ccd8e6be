import * as mariadb from "mariadb";
import { QueryTypes, Sequelize } from "sequelize";
import { getEnv, type Env } from "./env";
import { initModels } from "./models";

/** One Sequelize instance per process; models are bound to it. */
export function createSequelize(
  env: Pick<Env, "DATABASE_HOST" | "DATABASE_PORT" | "DATABASE_NAME" | "DATABASE_USER" | "DATABASE_PASSWORD">,
) {
  const sequelize = new Sequelize(env.DATABASE_NAME, env.DATABASE_USER, env.DATABASE_PASSWORD, {
    host: env.DATABASE_HOST,
    port: env.DATABASE_PORT,
    dialect: "mariadb",
    dialectModule: mariadb,
    logging: false,
    timezone: "+00:00",
    define: { underscored: true },
    pool: { max: 10, min: 0, acquire: 10_000, idle: 10_000 },
    // DECIMAL columns (volumes, masses, prices) arrive as numbers, for model and raw reads alike:
    // every value Decant keeps in one fits a double exactly enough, and no caller converts.
    dialectOptions: { connectTimeout: 5_000, decimalAsNumber: true },
  });
  initModels(sequelize);
  return sequelize;
}

let instance: Sequelize | undefined;

export function getSequelize(): Sequelize {
  instance ??= createSequelize(getEnv());
  return instance;
}

/** True when the database answers a trivial query. */
export async function databaseIsUp(sequelize = getSequelize()): Promise<boolean> {
  try {
    // Raw SELECTs always name their type: the mariadb dialect fails on untyped raw results.
    await sequelize.query("SELECT 1", { type: QueryTypes.SELECT });
    return true;
  } catch {
    return false;
  }
}

/**
 * The development profile's first start: a fresh database, migrated, then the small demo and the
 * generated demo year (src/db/history) loaded through the same umzug seeder `npm start` runs. Each
 * repetition gets a database of its own on the bench server (`decant_bench_demo_<n>`, dropped after).
 * The baseline is the small demo alone on another fresh database.
 */
import { createSequelize } from "../../src/lib/server/db";
import { parseEnv } from "../../src/lib/server/env";
import { migrator, seeder } from "../../src/db/umzug";
import { emit, fmt, main, row, stats } from "./lib";

const REPS = Number(process.env.BENCH_DEMO_REPS ?? 3);

async function seedFresh(n: number, year: boolean): Promise<number> {
  const env = parseEnv(process.env);
  const name = `decant_bench_demo_${n}`;
  const admin = createSequelize(env);
  await admin.query(`DROP DATABASE IF EXISTS \`${name}\``);
  await admin.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await admin.close();
  const sequelize = createSequelize({ ...env, DATABASE_NAME: name });
  try {
    await migrator(sequelize).up();
    const t0 = performance.now();
    await seeder(sequelize, { year }).up();
    return (performance.now() - t0) / 1000;
  } finally {
    await sequelize.query(`DROP DATABASE \`${name}\``);
    await sequelize.close();
  }
}

main(async () => {
  const small: number[] = [];
  const full: number[] = [];
  for (let i = 0; i < REPS; i++) {
    small.push(await seedFresh(i, false));
    full.push(await seedFresh(i, true));
    console.log(`demo: small demo ${fmt(small.at(-1)!, 1)} s, with the demo year ${fmt(full.at(-1)!, 1)} s`);
  }
  emit([
    row({ group: "demo", figure: "first start: small demo + demo year", unit: "s", stats: stats(full), target: { op: "<", value: 20 } }),
    row({ group: "demo", figure: "  small demo alone (baseline)", unit: "s", stats: stats(small) }),
  ]);
});

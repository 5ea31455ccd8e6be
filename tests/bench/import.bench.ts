/**
 * Import of 50,000 run-log rows (issue 6: under 30 s on this machine). A plain script, not a test:
 * `npm run bench -- import` (or `npx tsx tests/bench/import.bench.ts`). It starts the private test
 * MariaDB when no DATABASE_* environment is set (DECANT_TEST_DATA_DIR / DECANT_TEST_DB_PORT are
 * honoured), works in a scratch database of its own and drops it afterwards.
 *
 * Prints: the time to read and check the file (no writes), and the time of the commit, which
 * parses and checks again, then writes 50,000 runs and 200,000 ledger entries in one transaction.
 */
import { QueryTypes } from "sequelize";
import { migrator, seeder } from "../../src/db/umzug";
import { csvField } from "../../src/lib/imports/csv";
import { RUN_LOG_HEADER } from "../../src/lib/imports/run-log";
import { createSequelize, getSequelize } from "../../src/lib/server/db";
import type { SignedInUser } from "../../src/lib/server/guard";
import { parseEnv } from "../../src/lib/server/env";
import { checkRunLog, commitRunLog } from "../../src/lib/server/services/imports";

const ROWS = Number(process.env.BENCH_IMPORT_ROWS ?? 50_000);
const TARGET_S = 30;

async function main() {
  let stopServer: (() => Promise<void>) | null = null;
  if (!process.env.DATABASE_PORT) {
    const { startDatabase } = (await import("../../scripts/lib/stack.mjs")) as { startDatabase: (p: string) => Promise<{ server: { stop(): Promise<void> }; env: Record<string, string> }> };
    const { server, env } = await startDatabase("test");
    Object.assign(process.env, env);
    stopServer = () => server.stop();
  }
  const name = `decant_bench_import_${Date.now().toString(36)}`;
  const admin = createSequelize(parseEnv(process.env));
  await admin.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await admin.close();
  process.env.DATABASE_NAME = name;
  const sequelize = getSequelize();
  try {
    await migrator(sequelize).up();
    await seeder(sequelize).up();
    for (const [id, code, version, solvent] of [[91, "BENCH-A", 1, "water"], [92, "BENCH-B", 2, "acetonitrile"]] as const) {
      await sequelize.query(
        `INSERT INTO batches (id, code, recipe_version_id, spec_snapshot, volume_ml, remaining_ml, bottles, bottle_size_ml, prepared_by, prepared_at, expires_at, status, created_at, updated_at)
         VALUES (?, ?, ?, '{}', 100000000, 100000000, 1, 4000, 3, NOW() - INTERVAL 400 DAY, NOW() + INTERVAL 400 DAY, 'in_use', NOW(), NOW())`,
        { replacements: [id, code, version] },
      );
      await sequelize.query("INSERT INTO batch_components (batch_id, reagent_id, role, unit, target_amount) VALUES (?, ?, 'solvent', 'mL', 999000), (?, 'formic-acid', 'additive', 'mL', 1000)", { replacements: [id, solvent, id] });
    }
    const instruments = ["Wren", "Heron"];
    const projects = ["PMG-ROOT-26", "PCG-MASS-26", "ETA-RIVR-26", "QFT-IMP-014", "TBA-RES-007"];
    const start = Date.now() - 365 * 86_400_000;
    const lines = [RUN_LOG_HEADER.join(",")];
    for (let i = 0; i < ROWS; i++) {
      const values: Record<string, string> = {
        run_reference: `BENCH-${i}`, instrument: instruments[i % 2]!, method: "Scout gradient 5–95 % B, 12 min", project: projects[i % projects.length]!,
        started_at: new Date(start + i * 600_000).toISOString().slice(0, 16), injections: String(1 + (i % 40)), blanks: String(i % 3), purge_mL: i % 10 === 0 ? "5" : "",
        batch_A: "BENCH-A", batch_B: "BENCH-B", batch_C: "", batch_D: "", operator: i % 2 ? "tech@demo.test" : "",
      };
      lines.push(RUN_LOG_HEADER.map((c) => csvField(values[c])).join(","));
    }
    const content = `${lines.join("\r\n")}\r\n`;
    const tech = { id: 3, email: "tech@demo.test", name: "Rowan Ellery", role: "technician", clientId: null } as unknown as SignedInUser;
    console.log(`import bench: ${ROWS.toLocaleString("en-GB")} rows, ${(content.length / 1024 / 1024).toFixed(1)} MB`);

    let t0 = performance.now();
    const check = await checkRunLog(content, "bench.csv", tech);
    const checkS = (performance.now() - t0) / 1000;
    if (check.issues.length) throw new Error(`bench file has problems: ${JSON.stringify(check.issues.slice(0, 3))}`);
    console.log(`  check (read + validate, no writes): ${checkS.toFixed(2)} s`);

    t0 = performance.now();
    const report = await commitRunLog(content, "bench.csv", tech);
    const commitS = (performance.now() - t0) / 1000;
    const [{ n }] = (await sequelize.query<{ n: number }>("SELECT COUNT(*) AS n FROM ledger_entries WHERE source_kind = 'import'", { type: QueryTypes.SELECT })) as [{ n: number }];
    console.log(`  commit (read + validate + write ${report.newRuns.toLocaleString("en-GB")} runs, ${Number(n).toLocaleString("en-GB")} ledger entries, one transaction): ${commitS.toFixed(2)} s`);
    console.log(`  ${(ROWS / commitS).toFixed(0)} rows/s; target ${ROWS.toLocaleString("en-GB")} rows < ${TARGET_S} s: ${commitS < TARGET_S ? "met" : "NOT met"}`);

    t0 = performance.now();
    const again = await commitRunLog(content, "bench.csv", tech);
    console.log(`  re-upload of the same file: ${again.newRuns} new, ${again.alreadyRecorded.toLocaleString("en-GB")} recognised, ${((performance.now() - t0) / 1000).toFixed(2)} s`);
  } finally {
    await sequelize.query(`DROP DATABASE \`${name}\``).catch(() => undefined);
    await sequelize.close();
    if (stopServer) await stopServer();
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});

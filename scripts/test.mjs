// `npm test`: sets up its own database, fakes and app, runs Vitest and Playwright, and ends with
// one plain total over all runners: "N passed, N failed, N skipped".
import { mkdirSync, readFileSync, rmSync } from "node:fs";
import { join } from "node:path";
import { appServerCommand } from "./lib/app-server.mjs";
import { bin, ensureTestTools, ensureNodeModules, fail, log, portIsFree, portAnswers, ProcessGroup, run, waitFor } from "./lib/util.mjs";

const APP_PORT = Number(process.env.DECANT_TEST_APP_PORT || 4331);
/** Test files that run in a Vitest pass of their own (see below). */
const ISOLATED = ["tests/integration/faults.test.ts"];
// `npm test -- unit`, `-- integration` or `-- e2e` runs one part; `-- tests/integration/x.test.ts` one Vitest file.
const args = process.argv.slice(2);
const e2eFiles = args.filter((a) => a.startsWith("tests/e2e/"));
const files = args.filter((a) => a.includes("/") && !e2eFiles.includes(a));
const only = files.length || e2eFiles.length ? ["files"] : args;
const wants = (name) => only.length === 0 || only.includes(name);

ensureNodeModules();
const chromium = ensureTestTools();
const { startDatabase, migrate, startFakes } = await import("./lib/stack.mjs");

const { server, env, profile } = await startDatabase("test");
const reports = join(profile.dir, "reports");
rmSync(reports, { recursive: true, force: true });
mkdirSync(reports, { recursive: true });
rmSync(env.SMTP_FAKE_MAILBOX, { recursive: true, force: true });
mkdirSync(env.SMTP_FAKE_MAILBOX, { recursive: true });

// A fresh start every run: drop every database an earlier run left behind.
for (const name of server
  .sql("SELECT schema_name FROM information_schema.schemata WHERE schema_name LIKE 'decant%'")
  .split("\n")
  .filter(Boolean)) {
  server.sql(`DROP DATABASE \`${name}\``);
}
server.sql(`CREATE DATABASE \`${env.DATABASE_NAME}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);

const group = new ProcessGroup();
group.onCrash = (name) => process.stderr.write(`decant: ${name} stopped during the tests.\n`);
const totals = { passed: 0, failed: 0, skipped: 0 };
const summaries = [];
let exitCode = 0;

async function cleanUp() {
  await group.stopAll();
  await server.stop();
}
for (const signal of ["SIGINT", "SIGTERM"]) {
  process.on(signal, async () => {
    await cleanUp();
    process.exit(130);
  });
}

const baseURL = `http://127.0.0.1:${APP_PORT}`;
const outDir = process.env.DECANT_OUT_DIR ?? "dist";
const testEnv = {
  ...process.env,
  ...env,
  DECANT_OUT_DIR: outDir,
  APP_ORIGIN: baseURL,
  DECANT_NO_SCHEDULE: "1",
  E2E_BASE_URL: baseURL,
  CHROMIUM_PATH: chromium,
  HOST: "127.0.0.1",
  PORT: String(APP_PORT),
  NODE_ENV: "production",
};

function readJson(path) {
  try {
    return JSON.parse(readFileSync(path, "utf8"));
  } catch {
    return null;
  }
}

try {
  await migrate(env, { seed: true });
  await startFakes(group, env);

  if (only.length === 0) {
    log("Checking formatting (prettier --check)…");
    const formatted = await run(bin("prettier"), ["--check", "--log-level", "warn", "."], { env: testEnv });
    summaries.push(`Formatting: ${formatted === 0 ? "clean" : "files differ (run npx prettier --write .)"}`);
    if (formatted !== 0) {
      exitCode = 1;
      totals.failed += 1;
    }
    log("Type-checking (astro check)…");
    const code = await run(bin("astro"), ["check", "--minimumSeverity", "warning"], { env: testEnv });
    summaries.push(`Type check: ${code === 0 ? "clean" : "errors (run npx astro check)"}`);
    if (code !== 0) {
      exitCode = 1;
      totals.failed += 1;
    }
  }

  log("Building the app for the tests…");
  if ((await run(bin("astro"), ["build"], { env: testEnv, stdio: ["ignore", "ignore", "inherit"] })) !== 0)
    throw new Error("astro build failed");
  if (!(await portIsFree(APP_PORT)))
    throw new Error(`Port ${APP_PORT} for the test app is taken; set DECANT_TEST_APP_PORT to a free port.`);
  group.spawn("test app server", ...appServerCommand(outDir), { env: testEnv, stdio: ["ignore", "ignore", "inherit"] });
  await waitFor(() => portAnswers(APP_PORT), 30_000, 200);

  if (files.length) {
    const code = await run(bin("vitest"), ["run", ...files], { env: testEnv });
    summaries.push(`Vitest (${files.join(", ")}): exit ${code}`);
    if (code !== 0) exitCode = 1;
    totals[code === 0 ? "passed" : "failed"] += 1;
  }

  if (wants("unit") || wants("integration")) {
    const projects = only.length ? only.filter((o) => o === "unit" || o === "integration").map((o) => `tests/${o}`) : [];
    // The fault tests kill and restart a database server of their own mid-request; they run alone
    // after the rest, so their timing does not depend on what else the two cores are doing.
    const passes = [
      { name: "Vitest", args: [...projects, ...ISOLATED.map((f) => `--exclude=${f}`)] },
      ...(wants("integration") ? [{ name: "Vitest (fault injection, alone)", args: ISOLATED }] : []),
    ];
    for (const [index, pass] of passes.entries()) {
      const vitestReport = join(reports, `vitest-${index}.json`);
      const code = await run(
        bin("vitest"),
        ["run", ...pass.args, "--reporter=default", "--reporter=json", `--outputFile.json=${vitestReport}`],
        { env: testEnv },
      );
      const report = readJson(vitestReport);
      if (report) {
        const skipped = (report.numPendingTests ?? 0) + (report.numTodoTests ?? 0);
        totals.passed += report.numPassedTests;
        totals.failed += report.numFailedTests;
        totals.skipped += skipped;
        summaries.push(`${pass.name}: ${report.numPassedTests} passed, ${report.numFailedTests} failed, ${skipped} skipped`);
        if (report.numFailedTests > 0 || (report.numFailedTestSuites ?? 0) > 0) exitCode = 1;
        if ((report.numFailedTestSuites ?? 0) > 0 && report.numFailedTests === 0) totals.failed += report.numFailedTestSuites;
      } else {
        summaries.push(`${pass.name}: no report (it crashed before reporting)`);
        totals.failed += 1;
      }
      if (code !== 0) exitCode = 1;
    }
  }

  if (wants("e2e") || e2eFiles.length) {
    const playwrightReport = join(reports, "playwright.json");
    const code = await run(bin("playwright"), ["test", "--reporter=list,json", ...e2eFiles.map((f) => f.slice("tests/e2e/".length))], {
      env: { ...testEnv, PLAYWRIGHT_JSON_OUTPUT_NAME: playwrightReport },
    });
    const report = readJson(playwrightReport);
    if (report?.stats) {
      const { expected = 0, unexpected = 0, flaky = 0, skipped = 0 } = report.stats;
      totals.passed += expected + flaky;
      totals.failed += unexpected;
      totals.skipped += skipped;
      summaries.push(`Playwright: ${expected + flaky} passed, ${unexpected} failed, ${skipped} skipped${flaky ? ` (${flaky} flaky)` : ""}`);
      if (unexpected > 0) exitCode = 1;
    } else {
      summaries.push("Playwright: no report (it crashed before reporting)");
      totals.failed += 1;
    }
    if (code !== 0) exitCode = 1;
  }
} catch (error) {
  process.stderr.write(`decant: ${error instanceof Error ? error.message : error}\n`);
  exitCode = 1;
  totals.failed += totals.failed === 0 ? 1 : 0;
} finally {
  await cleanUp();
}

for (const line of summaries) console.log(line);
if (totals.passed + totals.failed === 0 && exitCode === 0) {
  fail("No test ran.");
}
console.log(`${totals.passed} passed, ${totals.failed} failed, ${totals.skipped} skipped`);
process.exit(exitCode);

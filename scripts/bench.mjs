// `npm run bench`: the benchmark of Decant against its own limits (never part of `npm test`).
// Sets up its own data (the `bench` profile: .data/bench, MariaDB on 3327, database decant_bench),
// seeds a million ledger entries, builds and serves the app on 4341, runs every measurement in
// tests/bench, times `npm start` itself, prints one table and writes tests/bench/results.json.
// `npm run bench -- chem labels` runs only the parts named (usage, http, labels, chem, import,
// pages, startup).
import { spawn } from "node:child_process";
import { cpus } from "node:os";
import { mkdirSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { appServerCommand } from "./lib/app-server.mjs";
import { bin, ensureNodeModules, fail, log, portAnswers, portIsFree, ProcessGroup, ROOT, run, waitFor } from "./lib/util.mjs";

const PARTS = ["usage", "http", "labels", "chem", "import", "pages", "lists", "startup", "demo"];
const asked = process.argv.slice(2);
for (const a of asked) if (!PARTS.includes(a)) fail(`Unknown benchmark part "${a}"; choose from ${PARTS.join(", ")}.`);
const wants = (part) => asked.length === 0 || asked.includes(part);
const needsApp = ["usage", "http", "import", "pages", "lists"].some(wants);

const APP_PORT = Number(process.env.DECANT_BENCH_APP_PORT || 4341);
const START_PORT = Number(process.env.DECANT_BENCH_START_PORT || 4342);
const STARTUP_REPS = Number(process.env.BENCH_STARTUP_REPS || 5);
const OUT_DIR = join(".data", "bench", "dist");
const began = Date.now();
const rows = [];
const extra = {};

ensureNodeModules();
const { startDatabase, migrate, startFakes } = await import("./lib/stack.mjs");

/** Runs one bench module; passes its output through and collects its `BENCH_*` lines. */
function runModule(file, env, runner = "tsx") {
  return new Promise((resolve, reject) => {
    const child = spawn(bin(runner), [join("tests/bench", file)], {
      cwd: ROOT,
      env: { ...process.env, ...env },
      stdio: ["ignore", "pipe", "inherit"],
    });
    const found = {};
    let buffer = "";
    child.stdout.on("data", (chunk) => {
      buffer += chunk;
      let nl;
      while ((nl = buffer.indexOf("\n")) >= 0) {
        const line = buffer.slice(0, nl);
        buffer = buffer.slice(nl + 1);
        const m = /^BENCH_([A-Z]+) (.*)$/.exec(line);
        if (m) found[m[1]] = JSON.parse(m[2]);
        else process.stdout.write(`  ${line}\n`);
      }
    });
    child.on("exit", (code) => (code === 0 ? resolve(found) : reject(new Error(`${file} failed (exit ${code})`))));
  });
}

let aborted = false;
/** Processes started outside the group (the bare servers, `npm start`), stopped on Ctrl-C. */
const loose = new Set();
function track(child) {
  loose.add(child);
  child.once("exit", () => loose.delete(child));
  return child;
}

async function part(name, fn) {
  if (!wants(name) || aborted) return;
  log(`bench: ${name}`);
  const t0 = Date.now();
  try {
    await fn();
  } catch (error) {
    process.stderr.write(`decant: bench ${name}: ${error instanceof Error ? error.message : error}\n`);
    rows.push({
      group: name,
      figure: `${name}: did not complete`,
      unit: "",
      median: NaN,
      min: NaN,
      max: NaN,
      n: 0,
      met: false,
      note: String(error),
    });
  }
  log(`bench: ${name} took ${((Date.now() - t0) / 1000).toFixed(0)} s`);
}

const group = new ProcessGroup();
let database = null;
let app = null;
async function stopStack() {
  await group.stopAll();
  if (database) await database.stop();
  database = null;
  app = null;
}
for (const signal of ["SIGINT", "SIGTERM"]) {
  process.on(signal, async () => {
    aborted = true;
    for (const child of loose) {
      try {
        process.kill(child.spawnargs[0] === "npm" ? -child.pid : child.pid, "SIGINT");
      } catch {
        /* gone */
      }
    }
    await stopStack();
    process.exit(130);
  });
}

let benchEnv = {};
/** The bench database's environment, once started (the demo part needs the database but no app). */
let databaseEnv = null;
try {
  if (needsApp) {
    if (!(await portIsFree(APP_PORT))) throw new Error(`Port ${APP_PORT} for the bench app is taken; set DECANT_BENCH_APP_PORT.`);
    const { server, env } = await startDatabase("bench");
    database = server;
    databaseEnv = env;
    // A fresh bench database every run: the figures always describe the same data.
    for (const name of server
      .sql("SELECT schema_name FROM information_schema.schemata WHERE schema_name LIKE 'decant%'")
      .split("\n")
      .filter(Boolean))
      server.sql(`DROP DATABASE \`${name}\``);
    server.sql(`CREATE DATABASE \`${env.DATABASE_NAME}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    rmSync(env.SMTP_FAKE_MAILBOX, { recursive: true, force: true });
    mkdirSync(env.SMTP_FAKE_MAILBOX, { recursive: true });
    await migrate(env, { seed: true });
    if (wants("usage")) {
      log("bench: seeding 1,000,000 ledger entries…");
      const seeded = await runModule("seed-usage.ts", env);
      extra.seed = seeded.SEED;
    }
    await startFakes(group, env);
    const baseURL = `http://127.0.0.1:${APP_PORT}`;
    const appEnv = {
      ...process.env,
      ...env,
      DECANT_OUT_DIR: OUT_DIR,
      HOST: "127.0.0.1",
      PORT: String(APP_PORT),
      APP_ORIGIN: baseURL,
      NODE_ENV: "production",
    };
    log("bench: building the app…");
    if ((await run(bin("astro"), ["build"], { env: appEnv, stdio: ["ignore", "ignore", "inherit"] })) !== 0)
      throw new Error("astro build failed");
    app = group.spawn("bench app server", ...appServerCommand(OUT_DIR), { env: appEnv, stdio: ["ignore", "ignore", "inherit"] });
    await waitFor(
      async () =>
        await fetch(`${baseURL}/api/health`).then(
          (r) => r.ok,
          () => false,
        ),
      60_000,
      200,
    );
    // One sign-in per role, reused by every measurement (sign-in is throttled; these never fail).
    const cookies = {};
    for (const [role, email] of [
      ["technician", "tech@demo.test"],
      ["manager", "manager@demo.test"],
      ["safety", "safety@demo.test"],
      ["client", "client@demo.test"],
      ["admin", "admin@demo.test"],
    ]) {
      const r = await fetch(`${baseURL}/api/auth/sign-in`, {
        method: "POST",
        headers: { "content-type": "application/json", origin: baseURL },
        body: JSON.stringify({ email, password: "decant-demo" }),
      });
      if (r.status !== 200) throw new Error(`sign-in as ${email} answered ${r.status}`);
      cookies[role] = (r.headers.get("set-cookie") ?? "").split(";")[0];
    }
    benchEnv = {
      ...env,
      BENCH_BASE_URL: baseURL,
      BENCH_COOKIES: JSON.stringify(cookies),
      BENCH_APP_PID: String(app.pid),
      BENCH_SEED: JSON.stringify(extra.seed ?? {}),
    };
  }

  await part("usage", async () => rows.push(...(await runModule("usage.bench.ts", benchEnv)).ROWS));
  await part("http", async () => rows.push(...(await runModule("http.bench.ts", benchEnv)).ROWS));
  await part("labels", async () => rows.push(...(await runModule("labels.bench.ts", {}, "vite-node")).ROWS));
  await part("chem", async () => rows.push(...(await runModule("chem.bench.ts", {})).ROWS));
  await part("import", async () => rows.push(...(await runModule("import.bench.ts", benchEnv)).ROWS));
  await part("pages", async () => rows.push(...(await runModule("pages.bench.ts", benchEnv)).ROWS));
  await part("lists", async () => rows.push(...(await runModule("lists.bench.ts", benchEnv)).ROWS));
  await part("demo", async () => {
    if (!databaseEnv) ({ server: database, env: databaseEnv } = await startDatabase("bench"));
    rows.push(...(await runModule("demo-year.bench.ts", databaseEnv)).ROWS);
  });
} catch (error) {
  process.stderr.write(`decant: ${error instanceof Error ? error.message : error}\n`);
  rows.push({
    group: "setup",
    figure: "bench setup did not complete",
    unit: "",
    median: NaN,
    min: NaN,
    max: NaN,
    n: 0,
    met: false,
    note: String(error),
  });
} finally {
  await stopStack();
}

// Start-up last, with the bench stack stopped: `npm start` brings up the bench profile's own
// MariaDB, fakes and app on a port of its own. The warm-up start builds the app (its folder is
// emptied first); the measured starts find that build current and serve it, as a restart of an
// unchanged checkout does.
await part("startup", async () => {
  if (!(await portIsFree(START_PORT))) throw new Error(`Port ${START_PORT} is taken; set DECANT_BENCH_START_PORT.`);
  const url = `http://127.0.0.1:${START_PORT}`;
  const bareMs = [];
  const healthMs = [];
  const pageMs = [];
  const startOut = join(".data", "bench", "dist-start");
  rmSync(join(ROOT, startOut), { recursive: true, force: true });
  for (let rep = 0; rep <= STARTUP_REPS; rep++) {
    // Baseline: a bare node:http process, from spawn to its first answer.
    let t0 = performance.now();
    if (aborted) return;
    const bare = track(
      spawn(process.execPath, ["-e", `require("node:http").createServer((q, s) => s.end("{}")).listen(${START_PORT}, "127.0.0.1")`], {
        stdio: "ignore",
      }),
    );
    await waitFor(
      () =>
        fetch(url).then(
          (r) => r.ok,
          () => false,
        ),
      10_000,
      10,
    );
    if (rep > 0) bareMs.push(performance.now() - t0);
    bare.kill("SIGTERM");
    await new Promise((r) => bare.once("exit", r));
    await waitFor(() => portIsFree(START_PORT), 10_000, 50);

    t0 = performance.now();
    const child = track(
      spawn("npm", ["start", "--silent"], {
        cwd: ROOT,
        detached: true,
        stdio: ["ignore", "ignore", "inherit"],
        env: { ...process.env, DECANT_PROFILE: "bench", PORT: String(START_PORT), DECANT_OUT_DIR: startOut },
      }),
    );
    const exited = new Promise((r) => child.once("exit", r));
    try {
      await waitFor(
        () =>
          fetch(`${url}/api/health`).then(
            async (r) => r.ok && (await r.json()).db === "up",
            () => false,
          ),
        180_000,
        25,
      );
      const health = performance.now() - t0;
      await waitFor(
        () =>
          fetch(`${url}/sign-in`).then(
            (r) => r.status === 200,
            () => false,
          ),
        30_000,
        25,
      );
      const page = performance.now() - t0;
      if (rep > 0) {
        healthMs.push(health);
        pageMs.push(page);
      }
      log(
        `bench: npm start ${rep === 0 ? "(warm-up, with build)" : rep}: health up ${(health / 1000).toFixed(1)} s, first page ${(page / 1000).toFixed(1)} s`,
      );
    } finally {
      try {
        process.kill(-child.pid, "SIGINT");
      } catch {
        /* already gone */
      }
      await Promise.race([exited, new Promise((r) => setTimeout(r, 60_000))]);
      await waitFor(async () => (await portIsFree(START_PORT)) && !(await portAnswers(3327)), 30_000, 100).catch(() => undefined);
    }
  }
  const s = (xs) => {
    const v = [...xs].sort((a, b) => a - b);
    const m = Math.floor(v.length / 2);
    return { median: v.length % 2 ? v[m] : (v[m - 1] + v[m]) / 2, min: v[0], max: v[v.length - 1], n: v.length };
  };
  const bare = s(bareMs.map((x) => x / 1000));
  const health = s(healthMs.map((x) => x / 1000));
  const page = s(pageMs.map((x) => x / 1000));
  rows.push({
    group: "startup",
    figure: "npm start → /api/health up (already built)",
    unit: "s",
    ...health,
    baseline: "bare node:http start",
    ratio: health.median / bare.median,
    met: null,
  });
  rows.push({
    group: "startup",
    figure: "npm start → first page (/sign-in, already built)",
    unit: "s",
    ...page,
    baseline: "bare node:http start",
    ratio: page.median / bare.median,
    met: null,
  });
  rows.push({ group: "startup", figure: "  bare node:http start (baseline)", unit: "s", ...bare, met: null });
});

// ---------------------------------------------------------------------------------------------
const wallSeconds = (Date.now() - began) / 1000;
const num = (x) =>
  x === undefined || x === null || Number.isNaN(x)
    ? "—"
    : Math.abs(x) >= 1000
      ? Math.round(x).toLocaleString("en-GB")
      : Math.abs(x) >= 10
        ? x.toFixed(1)
        : x.toFixed(2);
const targetText = (r) => {
  const parts = [];
  if (r.target) parts.push(`${r.targetOn ? `${r.targetOn} ` : ""}${r.target.op} ${num(r.target.value)} ${r.unit}`);
  if (r.ratioTarget) parts.push(`ratio ${r.ratioTarget.op} ${r.ratioTarget.value}`);
  return parts.join("; ") || "—";
};
const table = [["figure", "unit", "median", "min", "max", "n", "target", "ratio vs baseline", "met?"]];
for (const r of rows) {
  table.push([
    r.figure,
    r.unit,
    num(r.median),
    num(r.min),
    num(r.max),
    String(r.n ?? ""),
    targetText(r),
    r.ratio === undefined || r.ratio === null
      ? "—"
      : `${r.ratio >= 100 ? Math.round(r.ratio) : r.ratio.toFixed(r.ratio < 0.1 ? 3 : 2)} × ${r.baseline}`,
    r.met === true ? "yes" : r.met === false ? "NO" : "—",
  ]);
}
const widths = table[0].map((_, c) => Math.max(...table.map((line) => line[c].length)));
const out = table.map((line, i) => {
  const text = line.map((cell, c) => (c >= 2 && c <= 5 ? cell.padStart(widths[c]) : cell.padEnd(widths[c]))).join("  ");
  return i === 0 ? `${text}\n${widths.map((w) => "-".repeat(w)).join("  ")}` : text;
});
console.log(`\nDecant benchmark — ${new Date().toISOString()} — ${cpus().length} cores, Node ${process.version}\n`);
console.log(out.join("\n"));
const judged = rows.filter((r) => r.met !== null && r.met !== undefined);
const missed = judged.filter((r) => r.met === false);
console.log(`\n${judged.length - missed.length} of ${judged.length} targets met; wall time ${(wallSeconds / 60).toFixed(1)} min.`);
writeFileSync(
  join(ROOT, "tests/bench/results.json"),
  `${JSON.stringify({ at: new Date().toISOString(), wallSeconds, cores: cpus().length, node: process.version, parts: asked.length ? asked : PARTS, seed: extra.seed ?? null, rows }, null, 2)}\n`,
);
log("bench: wrote tests/bench/results.json");
process.exit(missed.length && rows.some((r) => r.figure.endsWith("did not complete")) ? 1 : 0);

/**
 * Import of 50,000 run-log rows through `POST /api/imports?mode=commit` (the server parses,
 * validates and writes 50,000 runs and 200,000 ledger entries in one transaction), signed in as
 * the technician, on the bench database. Peak memory is the app server's own: its peak RSS
 * (VmHWM) is reset before each upload through /proc/<pid>/clear_refs and read afterwards.
 * The baseline is `mode=check` on the same file: read and validate, no writes.
 */
import { readFileSync, writeFileSync } from "node:fs";
import mariadb from "mariadb";
import { csvField } from "../../src/lib/imports/csv";
import { RUN_LOG_HEADER } from "../../src/lib/imports/run-log";
import { benchEnv, emit, fmt, main, row, stats } from "./lib";

const ROWS = Number(process.env.BENCH_IMPORT_ROWS ?? 50_000);
const REPS = Number(process.env.BENCH_IMPORT_REPS ?? 5);

function peakKiB(pid: number): number | null {
  try {
    const m = /VmHWM:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, "utf8"));
    return m ? Number(m[1]) : null;
  } catch {
    return null;
  }
}
function resetPeak(pid: number): boolean {
  try {
    writeFileSync(`/proc/${pid}/clear_refs`, "5");
    return true;
  } catch {
    return false;
  }
}
const rssKiB = (pid: number) => {
  try {
    const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, "utf8"));
    return m ? Number(m[1]) : 0;
  } catch {
    return 0;
  }
};

function runLog(rows: number, tag: string): string {
  const instruments = ["Wren", "Heron"];
  const projects = ["PMG-ROOT-26", "PCG-MASS-26", "ETA-RIVR-26", "QFT-IMP-014", "TBA-RES-007"];
  // Two years and more back, before the seeded usage ledger, so the usage figures never see them.
  const start = Date.now() - 1200 * 86_400_000;
  const lines = [RUN_LOG_HEADER.join(",")];
  for (let i = 0; i < rows; i++) {
    const values: Record<string, string> = {
      run_reference: `BENCH-${tag}-${i}`,
      instrument: instruments[i % 2]!,
      method: "Scout gradient 5–95 % B, 12 min",
      project: projects[i % projects.length]!,
      started_at: new Date(start + i * 600_000).toISOString().slice(0, 16),
      injections: String(1 + (i % 40)),
      blanks: String(i % 3),
      purge_mL: i % 10 === 0 ? "5" : "",
      batch_A: "BENCH-A",
      batch_B: "BENCH-B",
      batch_C: "",
      batch_D: "",
      operator: i % 2 ? "tech@demo.test" : "",
    };
    lines.push(RUN_LOG_HEADER.map((c) => csvField(values[c])).join(","));
  }
  return `${lines.join("\r\n")}\r\n`;
}

main(async () => {
  const { baseURL, cookies, appPid } = benchEnv();
  const conn = await mariadb.createConnection({
    host: process.env.DATABASE_HOST,
    port: Number(process.env.DATABASE_PORT),
    user: process.env.DATABASE_USER,
    password: process.env.DATABASE_PASSWORD,
    database: process.env.DATABASE_NAME,
    timezone: "Z",
  });
  for (const [id, code, version, solvent] of [
    [91, "BENCH-A", 1, "water"],
    [92, "BENCH-B", 2, "acetonitrile"],
  ] as const) {
    await conn.query(
      `INSERT IGNORE INTO batches (id, code, recipe_version_id, spec_snapshot, volume_ml, remaining_ml, bottles, bottle_size_ml, prepared_by, prepared_at, expires_at, status, created_at, updated_at)
       VALUES (?, ?, ?, '{}', 100000000000, 100000000000, 1, 4000, 3, NOW() - INTERVAL 1300 DAY, NOW() + INTERVAL 400 DAY, 'in_use', NOW(), NOW())`,
      [id, code, version],
    );
    await conn.query(
      "INSERT INTO batch_components (batch_id, reagent_id, role, unit, target_amount) SELECT ?, ?, 'solvent', 'mL', 999000 FROM DUAL WHERE NOT EXISTS (SELECT 1 FROM batch_components WHERE batch_id = ?)",
      [id, solvent, id],
    );
    await conn.query(
      "INSERT INTO batch_components (batch_id, reagent_id, role, unit, target_amount) SELECT ?, 'formic-acid', 'additive', 'mL', 1000 FROM DUAL WHERE (SELECT COUNT(*) FROM batch_components WHERE batch_id = ?) < 2",
      [id, id],
    );
  }
  await conn.end();

  const post = async (content: string, mode: "check" | "commit") => {
    const r = await fetch(`${baseURL}/api/imports?mode=${mode}&fileName=bench.csv`, {
      method: "POST",
      headers: { cookie: cookies.technician!, "content-type": "text/csv", origin: baseURL },
      body: content,
    });
    const text = await r.text();
    if (r.status !== (mode === "commit" ? 201 : 200)) throw new Error(`import ${mode} answered ${r.status}: ${text.slice(0, 300)}`);
    return JSON.parse(text) as { newRuns?: number; issues?: unknown[] };
  };

  const canReset = appPid > 0 && resetPeak(appPid);
  // Warm-up: a small file through both modes.
  const small = runLog(2_000, `w${Date.now().toString(36)}`);
  await post(small, "check");
  await post(small, "commit");

  const checkMs: number[] = [];
  const commitMs: number[] = [];
  const peaks: number[] = [];
  for (let rep = 0; rep < REPS; rep++) {
    const content = runLog(ROWS, `${Date.now().toString(36)}r${rep}`);
    let t0 = performance.now();
    const check = await post(content, "check");
    checkMs.push(performance.now() - t0);
    if (check.issues?.length) throw new Error(`bench file has problems: ${JSON.stringify(check.issues.slice(0, 3))}`);
    if (canReset) resetPeak(appPid);
    let polled = 0;
    const poll = setInterval(() => (polled = Math.max(polled, rssKiB(appPid))), 50);
    t0 = performance.now();
    const report = await post(content, "commit");
    commitMs.push(performance.now() - t0);
    clearInterval(poll);
    const peak = Math.max(canReset ? (peakKiB(appPid) ?? 0) : 0, polled);
    peaks.push(peak / 1024);
    console.log(
      `  import ${rep + 1}: check ${fmt(checkMs.at(-1)! / 1000, 2)} s, commit ${fmt(commitMs.at(-1)! / 1000, 2)} s (${report.newRuns} runs), server peak RSS ${fmt(peak / 1024)} MB`,
    );
  }
  const commit = stats(commitMs.map((ms) => ms / 1000));
  const checkS = stats(checkMs.map((ms) => ms / 1000));
  const peak = stats(peaks);
  emit([
    row({
      group: "import",
      figure: `CSV import, ${fmt(ROWS)} rows committed (HTTP)`,
      unit: "s",
      stats: commit,
      target: { op: "<", value: 30 },
      baseline: "check only (read + validate)",
      ratio: commit.median / checkS.median,
    }),
    row({ group: "import", figure: "  check only, same file (baseline)", unit: "s", stats: checkS }),
    row({
      group: "import",
      figure: `server peak RSS during the commit${canReset ? "" : " (polled)"}`,
      unit: "MB",
      stats: peak,
      targetOn: "max",
      targetValue: peak.max,
      target: { op: "<", value: 500 },
    }),
  ]);
});

/**
 * The paged lists at scale. Seeds, on the bench database, 100,000 runs (10 ledger entries each: a
 * million) and a million audit lines with the server's own sequence tables (INSERT … SELECT), then
 * times signed-in requests: the first and the 200th page of `GET /api/runs` (50 rows a page, the
 * 200th reached by following cursors), a search by run reference, and the first page of
 * `GET /api/audit` (manager). The baseline is the same first page of runs as raw SQL through the driver.
 */
import mariadb from "mariadb";
import { benchEnv, emit, fmt, main, row, stats, type BenchRow } from "./lib";

const REPS = Number(process.env.BENCH_LISTS_REPS ?? 30);
const RUNS = Number(process.env.BENCH_LIST_RUNS ?? 100_000);
const AUDIT = Number(process.env.BENCH_AUDIT_LINES ?? 1_000_000);

main(async () => {
  const { baseURL, cookies } = benchEnv();
  const conn = await mariadb.createConnection({
    host: process.env.DATABASE_HOST,
    port: Number(process.env.DATABASE_PORT),
    user: process.env.DATABASE_USER,
    password: process.env.DATABASE_PASSWORD,
    database: process.env.DATABASE_NAME,
    timezone: "Z",
  });
  const [ref] = (await conn.query(
    `SELECT (SELECT MIN(id) FROM instruments) AS instrument, (SELECT MIN(id) FROM methods) AS method, (SELECT MIN(id) FROM projects) AS project,
            (SELECT MIN(id) FROM users) AS user, (SELECT MIN(id) FROM batches) AS batch, (SELECT MIN(reagent_id) FROM batch_components) AS reagent`,
  )) as { instrument: number; method: number; project: number; user: number; batch: number; reagent: string }[];
  let t0 = performance.now();
  const before = Number(((await conn.query("SELECT MAX(id) AS id FROM runs")) as { id: number | null }[])[0]?.id ?? 0);
  // A year of runs, one every ~5 minutes, ending now; references BR-000001…
  await conn.query(
    `INSERT INTO runs (instrument_id, method_id, project_id, operator_id, reference, started_at, injections, blanks, purge_ml, channel_batches, channel_volumes, created_at, updated_at)
     SELECT ?, ?, ?, ?, CONCAT('BR-', LPAD(seq, 6, '0')), NOW(3) - INTERVAL (? - seq) * 315 SECOND, 1 + seq MOD 40, 0, 0, '{}', '{"A": 12.5}', NOW(), NOW()
       FROM seq_1_to_${RUNS}`,
    [ref!.instrument, ref!.method, ref!.project, ref!.user, RUNS],
  );
  await conn.query(
    `INSERT INTO ledger_entries (occurred_at, project_id, kind, batch_id, reagent_id, volume_ml, source_kind, source_id, author_id, created_at)
     SELECT r.started_at, r.project_id, 'run', ?, ?, 1.25, 'seed', CONCAT('run:', r.id), ?, NOW()
       FROM runs r JOIN seq_1_to_10 s WHERE r.id > ?`,
    [ref!.batch, ref!.reagent, ref!.user, before],
  );
  console.log(`lists: seeded ${fmt(RUNS)} runs and ${fmt(RUNS * 10)} ledger entries in ${fmt((performance.now() - t0) / 1000, 1)} s`);
  t0 = performance.now();
  await conn.query(
    `INSERT INTO audit_log (actor_id, action, entity, entity_id, \`before\`, \`after\`, created_at)
     SELECT ?, ELT(1 + seq MOD 4, 'record', 'run.log', 'update', 'approve'), ELT(1 + seq MOD 4, 'batch', 'run', 'instrument', 'recipe'),
            seq MOD 5000, JSON_OBJECT('status', 'ready'), JSON_OBJECT('status', 'in_use', 'n', seq), NOW(3) - INTERVAL (? - seq) * 30 SECOND
       FROM seq_1_to_${AUDIT}`,
    [ref!.user, AUDIT],
  );
  console.log(`lists: seeded ${fmt(AUDIT)} audit lines in ${fmt((performance.now() - t0) / 1000, 1)} s`);
  await conn.query("ANALYZE TABLE runs, ledger_entries, audit_log");

  const get = async (path: string, role: string) => {
    const start = performance.now();
    const r = await fetch(`${baseURL}${path}`, { headers: { cookie: cookies[role]! } });
    const body = (await r.json()) as { items?: unknown[]; nextCursor?: string | null };
    if (r.status !== 200 || !Array.isArray(body.items)) throw new Error(`GET ${path} answered ${r.status}`);
    return { ms: performance.now() - start, body };
  };
  // The 200th page's cursor, by following 199 cursors (as a person paging would).
  let cursor: string | null = null;
  for (let i = 0; i < 199; i++) {
    const page: { body: { nextCursor?: string | null } } = await get(
      `/api/runs?limit=50${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ""}`,
      "technician",
    );
    cursor = page.body.nextCursor ?? null;
    if (!cursor) throw new Error(`the run list ended after ${i + 1} pages`);
  }
  const reference = `BR-${String(Math.floor(RUNS / 3)).padStart(6, "0")}`;
  const cases = [
    { figure: "GET /api/runs, first page", path: "/api/runs?limit=50", role: "technician", target: 50 },
    {
      figure: "GET /api/runs, 200th page",
      path: `/api/runs?limit=50&cursor=${encodeURIComponent(cursor!)}`,
      role: "technician",
      target: 50,
    },
    { figure: "GET /api/runs, search by run reference", path: `/api/runs?limit=50&q=${reference}`, role: "technician", target: 50 },
    { figure: "GET /api/audit, first page (1,000,000 lines)", path: "/api/audit?limit=50", role: "manager", target: 100 },
    { figure: "GET /api/audit, one kind of record", path: "/api/audit?limit=50&entity=recipe", role: "manager", target: 100 },
  ];
  const raw = async () => {
    const start = performance.now();
    await conn.query("SELECT r.id, r.reference, r.started_at FROM runs r ORDER BY r.started_at DESC, r.id DESC LIMIT 51");
    return performance.now() - start;
  };
  const explain = (await conn.query(
    "EXPLAIN SELECT r.id FROM runs r WHERE r.started_at < NOW() OR (r.started_at = NOW() AND r.id < 5) ORDER BY r.started_at DESC, r.id DESC LIMIT 51",
  )) as Record<string, unknown>[];
  console.log(`EXPLAIN of a later run page: key=${explain[0]?.key} type=${explain[0]?.type} rows=${explain[0]?.rows}`);
  const rows: BenchRow[] = [];
  const baseline: number[] = [];
  for (let i = 0; i < 3; i++) await raw();
  for (const c of cases) {
    await get(c.path, c.role);
    const samples: number[] = [];
    for (let i = 0; i < REPS; i++) {
      samples.push((await get(c.path, c.role)).ms);
      if (baseline.length < REPS) baseline.push(await raw());
    }
    const s = stats(samples);
    console.log(`${c.figure}: median ${fmt(s.median, 1)} ms, p95 ${fmt(s.p95, 1)} ms`);
    rows.push(
      row({
        group: "lists",
        figure: `${c.figure} (p95 ${fmt(s.p95, 1)} ms)`,
        unit: "ms",
        stats: s,
        targetOn: "p95",
        targetValue: s.p95,
        target: { op: "<", value: c.target },
      }),
    );
  }
  rows.push(row({ group: "lists", figure: "  raw SQL, first page of runs (baseline)", unit: "ms", stats: stats(baseline) }));
  await conn.end();
  emit(rows);
});

/**
 * Usage at scale, on the bench database `scripts/bench.mjs` seeded (tests/bench/seed-usage.ts):
 * `GET /api/usage?groupBy=project` signed in as the manager, for one month and for one year,
 * against the plain aggregate over `ledger_entries` sent as raw SQL through the driver (the
 * baseline). Prints the query plan of the endpoint's aggregate.
 */
import mariadb from "mariadb";
import { benchEnv, emit, fmt, main, row, stats, type BenchRow } from "./lib";
import { usageSumsSql } from "../../src/lib/server/services/usage";

const REPS = Number(process.env.BENCH_USAGE_REPS ?? 20);

main(async () => {
  const { baseURL, cookies } = benchEnv();
  const seed = JSON.parse(process.env.BENCH_SEED ?? "{}") as { from: string; to: string };
  const conn = await mariadb.createConnection({
    host: process.env.DATABASE_HOST,
    port: Number(process.env.DATABASE_PORT),
    user: process.env.DATABASE_USER,
    password: process.env.DATABASE_PASSWORD,
    database: process.env.DATABASE_NAME,
    timezone: "Z",
  });
  // A month and a year in the seeded ledger's second year (its rates change half-way).
  const first = new Date(`${seed.from}T00:00:00Z`);
  const monthFrom = new Date(Date.UTC(first.getUTCFullYear() + 1, first.getUTCMonth() + 1, 1));
  const monthTo = new Date(Date.UTC(monthFrom.getUTCFullYear(), monthFrom.getUTCMonth() + 1, 0));
  const yearFrom = new Date(Date.UTC(first.getUTCFullYear(), first.getUTCMonth() + 6, 1));
  const yearTo = new Date(yearFrom.getTime() + 364 * 86_400_000);
  const day = (d: Date) => d.toISOString().slice(0, 10);
  const periods = [
    { name: "month", from: day(monthFrom), to: day(monthTo), target: 150 },
    { name: "year", from: day(yearFrom), to: day(yearTo), target: 600 },
  ];

  const explain = await conn.query(
    `EXPLAIN ${usageSumsSql(", CASE WHEN d.day < ? THEN 0 ELSE 1 END")
      .replace(/:from/, "?")
      .replace(/:to/, "?")
      .replace(/:clientId/g, "NULL")}`,
    [periods[1]!.from, periods[1]!.to, day(new Date(yearFrom.getTime() + 182 * 86_400_000))],
  );
  console.log("EXPLAIN of the endpoint's aggregate (year):");
  for (const r of explain as Record<string, unknown>[])
    console.log(
      `  ${Object.entries(r)
        .map(([k, v]) => `${k}=${v}`)
        .join("  ")}`,
    );

  const rows: BenchRow[] = [];
  for (const p of periods) {
    const url = `${baseURL}/api/usage?from=${p.from}&to=${p.to}&groupBy=project`;
    const get = async () => {
      const t0 = performance.now();
      const r = await fetch(url, { headers: { cookie: cookies.manager! } });
      const body = (await r.json()) as { rows?: unknown[] };
      if (r.status !== 200 || !Array.isArray(body.rows)) throw new Error(`GET /api/usage answered ${r.status}`);
      return { ms: performance.now() - t0, n: body.rows.length };
    };
    const raw = async () => {
      const t0 = performance.now();
      const result = await conn.query(
        `SELECT l.project_id, l.reagent_id, SUM(l.volume_ml) AS volume, SUM(l.mass_g) AS mass FROM ledger_entries l
          WHERE l.occurred_at >= ? AND l.occurred_at < ? + INTERVAL 1 DAY AND l.project_id IS NOT NULL GROUP BY l.project_id, l.reagent_id`,
        [p.from, p.to],
      );
      return { ms: performance.now() - t0, n: (result as unknown[]).length };
    };
    // Interleaved, after a warm-up of each, so that both see the same machine.
    await get();
    await get();
    await raw();
    const endpoint: number[] = [];
    const baseline: number[] = [];
    let projects = 0;
    for (let i = 0; i < REPS; i++) {
      const e = await get();
      projects = e.n;
      endpoint.push(e.ms);
      if (i < Math.max(5, Math.ceil(REPS / 2))) baseline.push((await raw()).ms);
    }
    const es = stats(endpoint);
    const bs = stats(baseline);
    console.log(
      `usage ${p.name} ${p.from}…${p.to}: endpoint median ${fmt(es.median, 1)} ms, p95 ${fmt(es.p95, 1)} ms (${projects} projects); raw SQL over ledger_entries median ${fmt(bs.median, 1)} ms`,
    );
    rows.push(
      row({
        group: "usage",
        figure: `GET /api/usage, one ${p.name} (p95 ${fmt(es.p95, 1)} ms)`,
        unit: "ms",
        stats: es,
        targetOn: "p95",
        targetValue: es.p95,
        target: { op: "<", value: p.target },
        baseline: "raw SQL aggregate over ledger_entries",
        ratio: es.median / bs.median,
        ratioTarget: { op: "<=", value: 1.5 },
      }),
    );
    rows.push(row({ group: "usage", figure: `  raw SQL, one ${p.name} (baseline)`, unit: "ms", stats: bs }));
  }
  await conn.end();
  emit(rows);
});

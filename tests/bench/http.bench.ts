/**
 * HTTP serving under load (autocannon, 50 connections, loopback): the signed-in JSON read
 * `GET /api/batches` and the technician's server-rendered `/home`, against a bare `node:http`
 * server answering a fixed JSON body of the same size, started here as a separate process.
 * Each figure: a short warm-up, then BENCH_HTTP_REPS runs of BENCH_HTTP_SECONDS each.
 */
import { spawn } from "node:child_process";
import autocannon from "autocannon";
import { benchEnv, emit, fmt, main, row, stats, type BenchRow } from "./lib";

const SECONDS = Number(process.env.BENCH_HTTP_SECONDS ?? 10);
const REPS = Number(process.env.BENCH_HTTP_REPS ?? 5);
const CONNECTIONS = 50;
const BARE_PORT = Number(process.env.BENCH_BARE_PORT ?? 4349);

interface Run { rps: number; p99: number; p50: number; errors: number; non2xx: number }

function cannon(url: string, headers: Record<string, string>, duration: number): Promise<Run> {
  return new Promise((resolve, reject) => {
    autocannon({ url, connections: CONNECTIONS, duration, headers }, (error, result) => {
      if (error) return reject(error);
      resolve({ rps: result.requests.average, p99: result.latency.p99, p50: result.latency.p50, errors: result.errors + result.timeouts, non2xx: result.non2xx });
    });
  });
}

async function series(name: string, url: string, headers: Record<string, string>): Promise<Run[]> {
  await cannon(url, headers, 2);
  const runs: Run[] = [];
  for (let i = 0; i < REPS; i++) {
    const r = await cannon(url, headers, SECONDS);
    if (r.non2xx > 0 || r.errors > 0) throw new Error(`${name}: ${r.non2xx} non-2xx answers, ${r.errors} errors`);
    runs.push(r);
    console.log(`  ${name} run ${i + 1}: ${fmt(r.rps)} req/s, p50 ${r.p50} ms, p99 ${r.p99} ms`);
  }
  return runs;
}

main(async () => {
  const { baseURL, cookies } = benchEnv();
  const sample = await fetch(`${baseURL}/api/batches`, { headers: { cookie: cookies.technician! } });
  if (sample.status !== 200) throw new Error(`GET /api/batches answered ${sample.status}`);
  const body = await sample.text();
  const bare = spawn(process.execPath, ["-e", `
    const body = Buffer.from(process.env.BODY);
    require("node:http").createServer((req, res) => { res.writeHead(200, { "content-type": "application/json", "content-length": body.length }); res.end(body); })
      .listen(${BARE_PORT}, "127.0.0.1", () => console.log("listening"));`], { env: { ...process.env, BODY: body }, stdio: ["ignore", "pipe", "inherit"] });
  await new Promise<void>((resolve, reject) => {
    bare.stdout.once("data", () => resolve());
    bare.once("exit", (code) => reject(new Error(`bare server exited (${code})`)));
  });
  try {
    const rows: BenchRow[] = [];
    console.log(`http: ${CONNECTIONS} connections, ${REPS} × ${SECONDS} s each; bare body ${body.length} bytes`);
    const bareRuns = await series("bare node:http", `http://127.0.0.1:${BARE_PORT}/`, {});
    const json = await series("GET /api/batches", `${baseURL}/api/batches`, { cookie: cookies.technician! });
    const page = await series("GET /home (technician)", `${baseURL}/home`, { cookie: cookies.technician! });
    const bareRps = stats(bareRuns.map((r) => r.rps));
    const jsonRps = stats(json.map((r) => r.rps));
    const pageRps = stats(page.map((r) => r.rps));
    const jsonP99 = stats(json.map((r) => r.p99));
    const pageP99 = stats(page.map((r) => r.p99));
    const bareP99 = stats(bareRuns.map((r) => r.p99));
    const base = "bare node:http req/s";
    rows.push(row({ group: "http", figure: "GET /api/batches throughput", unit: "req/s", stats: jsonRps, baseline: base, ratio: jsonRps.median / bareRps.median, ratioTarget: { op: ">=", value: 0.25 } }));
    rows.push(row({ group: "http", figure: "GET /api/batches p99 latency", unit: "ms", stats: jsonP99, target: { op: "<", value: 50 }, baseline: "bare node:http p99", ratio: jsonP99.median / Math.max(1, bareP99.median) }));
    rows.push(row({ group: "http", figure: "GET /home (technician) throughput", unit: "req/s", stats: pageRps, baseline: base, ratio: pageRps.median / bareRps.median, ratioTarget: { op: ">=", value: 0.1 } }));
    rows.push(row({ group: "http", figure: "GET /home (technician) p99 latency", unit: "ms", stats: pageP99, baseline: "bare node:http p99", ratio: pageP99.median / Math.max(1, bareP99.median) }));
    rows.push(row({ group: "http", figure: "  bare node:http throughput (baseline)", unit: "req/s", stats: bareRps }));
    emit(rows);
  } finally {
    bare.kill("SIGTERM");
  }
});

/**
 * HTTP serving under load (autocannon, 50 connections, loopback): the signed-in JSON read
 * `GET /api/batches` and the technician's server-rendered `/home`, against two baselines run on
 * the same machine in the same run:
 * - a bare `node:http` server answering a fixed body of the same size (the target's baseline);
 * - the framework's floor: an empty Astro app with the same adapter (`framework-floor/`) answering
 *   the same fixed JSON and HTML bodies, so the table shows how much of the gap is Decant's own.
 * Besides throughput and latency it reports each server's CPU time per request (user + system, from
 * /proc/<pid>/stat), which a busy shared machine disturbs far less than requests per second.
 * Each figure: a short warm-up, then BENCH_HTTP_REPS runs of BENCH_HTTP_SECONDS each.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { readFileSync } from "node:fs";
import { join, resolve } from "node:path";
import autocannon from "autocannon";
import { benchEnv, emit, fmt, main, row, stats, type BenchRow } from "./lib";

const SECONDS = Number(process.env.BENCH_HTTP_SECONDS ?? 6);
const REPS = Number(process.env.BENCH_HTTP_REPS ?? 5);
const CONNECTIONS = 50;
const BARE_PORT = Number(process.env.BENCH_BARE_PORT ?? 4349);
const FLOOR_PORT = Number(process.env.BENCH_FLOOR_PORT ?? 4348);
const FLOOR_ROOT = resolve("tests/bench/framework-floor");
const FLOOR_OUT = resolve(".data/bench/floor-dist");

interface Run {
  rps: number;
  p99: number;
  p50: number;
  cpuPerRequest_ms: number;
}

/** CPU seconds the process has used so far (user + system), from /proc. */
function cpuSeconds(pid: number): number {
  const fields = readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1]!.split(" ");
  return (Number(fields[11]) + Number(fields[12])) / 100; // utime and stime, in clock ticks of 1/100 s
}

function cannon(url: string, headers: Record<string, string>, duration: number, pid: number): Promise<Run> {
  const cpu0 = cpuSeconds(pid);
  return new Promise((resolvePromise, reject) => {
    autocannon({ url, connections: CONNECTIONS, duration, headers }, (error, result) => {
      if (error) return reject(error);
      const failures = result.errors + result.timeouts + result.non2xx;
      if (failures > 0) return reject(new Error(`${url}: ${result.non2xx} non-2xx answers, ${result.errors + result.timeouts} errors`));
      const requests = result.requests.total;
      resolvePromise({
        rps: result.requests.average,
        p99: result.latency.p99,
        p50: result.latency.p50,
        cpuPerRequest_ms: ((cpuSeconds(pid) - cpu0) * 1000) / Math.max(1, requests),
      });
    });
  });
}

async function series(name: string, url: string, headers: Record<string, string>, pid: number): Promise<Run[]> {
  await cannon(url, headers, 2, pid);
  const runs: Run[] = [];
  for (let i = 0; i < REPS; i++) {
    const r = await cannon(url, headers, SECONDS, pid);
    runs.push(r);
    console.log(
      `  ${name} run ${i + 1}: ${fmt(r.rps)} req/s, p50 ${r.p50} ms, p99 ${r.p99} ms, ${fmt(r.cpuPerRequest_ms, 3)} ms CPU per request`,
    );
  }
  return runs;
}

/** Starts a server process and resolves once its port answers. */
async function startServer(name: string, args: string[], env: NodeJS.ProcessEnv, port: number): Promise<ChildProcess> {
  const child = spawn(process.execPath, args, {
    env: { ...process.env, ...env, HOST: "127.0.0.1", PORT: String(port) },
    stdio: ["ignore", "ignore", "inherit"],
  });
  const deadline = Date.now() + 30_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`${name} exited (${child.exitCode})`);
    if (
      await fetch(`http://127.0.0.1:${port}/`).then(
        () => true,
        () => false,
      )
    )
      return child;
    if (Date.now() > deadline) throw new Error(`${name} did not answer within 30 s`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

function buildFloor(): Promise<void> {
  return new Promise((resolvePromise, reject) => {
    const child = spawn(resolve("node_modules/.bin/astro"), ["build", "--root", FLOOR_ROOT], {
      env: { ...process.env, FLOOR_OUT_DIR: FLOOR_OUT },
      stdio: ["ignore", "ignore", "inherit"],
    });
    child.once("exit", (code) => (code === 0 ? resolvePromise() : reject(new Error(`building the framework floor app failed (${code})`))));
  });
}

main(async () => {
  const { baseURL, cookies, appPid } = benchEnv();
  const get = async (path: string) => {
    const r = await fetch(`${baseURL}${path}`, { headers: { cookie: cookies.technician! } });
    if (r.status !== 200) throw new Error(`GET ${path} answered ${r.status}`);
    return r.text();
  };
  const json = await get("/api/batches");
  const html = await get("/home");
  await buildFloor();

  const servers: ChildProcess[] = [];
  try {
    const bare = await startServer(
      "bare node:http",
      [
        "-e",
        `
      const body = Buffer.from(process.env.BODY);
      require("node:http").createServer((req, res) => { res.writeHead(200, { "content-type": "application/json", "content-length": body.length }); res.end(body); })
        .listen(Number(process.env.PORT), "127.0.0.1");`,
      ],
      { BODY: json },
      BARE_PORT,
    );
    servers.push(bare);
    const floor = await startServer(
      "framework floor",
      [join(FLOOR_OUT, "server/entry.mjs")],
      { FLOOR_JSON: json, FLOOR_HTML: html, NODE_ENV: "production" },
      FLOOR_PORT,
    );
    servers.push(floor);

    console.log(`http: ${CONNECTIONS} connections, ${REPS} × ${SECONDS} s each; JSON body ${json.length} bytes, page ${html.length} bytes`);
    const cookie = { cookie: cookies.technician! };
    const bareRuns = await series("bare node:http", `http://127.0.0.1:${BARE_PORT}/`, {}, bare.pid!);
    const floorJson = await series("empty Astro endpoint", `http://127.0.0.1:${FLOOR_PORT}/api/fixed`, {}, floor.pid!);
    const floorPage = await series("empty Astro page", `http://127.0.0.1:${FLOOR_PORT}/page`, {}, floor.pid!);
    const jsonRuns = await series("GET /api/batches", `${baseURL}/api/batches`, cookie, appPid);
    const pageRuns = await series("GET /home (technician)", `${baseURL}/home`, cookie, appPid);

    const rps = (runs: Run[]) => stats(runs.map((r) => r.rps));
    const p99 = (runs: Run[]) => stats(runs.map((r) => r.p99));
    const cpu = (runs: Run[]) => stats(runs.map((r) => r.cpuPerRequest_ms));
    const bareRps = rps(bareRuns);
    const bareCpu = cpu(bareRuns);
    const rows: BenchRow[] = [
      row({
        group: "http",
        figure: "GET /api/batches throughput",
        unit: "req/s",
        stats: rps(jsonRuns),
        baseline: "bare node:http req/s",
        ratio: rps(jsonRuns).median / bareRps.median,
        ratioTarget: { op: ">=", value: 0.25 },
      }),
      row({
        group: "http",
        figure: "  ÷ empty Astro endpoint (framework floor)",
        unit: "req/s",
        stats: rps(jsonRuns),
        baseline: "empty Astro endpoint req/s",
        ratio: rps(jsonRuns).median / rps(floorJson).median,
      }),
      row({
        group: "http",
        figure: "GET /api/batches p99 latency",
        unit: "ms",
        stats: p99(jsonRuns),
        target: { op: "<", value: 50 },
        baseline: "empty Astro endpoint p99",
        ratio: p99(jsonRuns).median / Math.max(1, p99(floorJson).median),
      }),
      row({
        group: "http",
        figure: "GET /api/batches CPU per request",
        unit: "ms",
        stats: cpu(jsonRuns),
        baseline: "bare node:http CPU per request",
        ratio: cpu(jsonRuns).median / bareCpu.median,
      }),
      row({
        group: "http",
        figure: "GET /home (technician) throughput",
        unit: "req/s",
        stats: rps(pageRuns),
        baseline: "bare node:http req/s",
        ratio: rps(pageRuns).median / bareRps.median,
        ratioTarget: { op: ">=", value: 0.1 },
      }),
      row({
        group: "http",
        figure: "  ÷ empty Astro page (framework floor)",
        unit: "req/s",
        stats: rps(pageRuns),
        baseline: "empty Astro page req/s",
        ratio: rps(pageRuns).median / rps(floorPage).median,
      }),
      row({
        group: "http",
        figure: "GET /home (technician) p99 latency",
        unit: "ms",
        stats: p99(pageRuns),
        baseline: "empty Astro page p99",
        ratio: p99(pageRuns).median / Math.max(1, p99(floorPage).median),
      }),
      row({
        group: "http",
        figure: "GET /home (technician) CPU per request",
        unit: "ms",
        stats: cpu(pageRuns),
        baseline: "bare node:http CPU per request",
        ratio: cpu(pageRuns).median / bareCpu.median,
      }),
      row({ group: "http", figure: "  bare node:http throughput (baseline)", unit: "req/s", stats: bareRps }),
      row({ group: "http", figure: "  bare node:http CPU per request", unit: "ms", stats: bareCpu }),
      row({
        group: "http",
        figure: "  empty Astro endpoint throughput (floor)",
        unit: "req/s",
        stats: rps(floorJson),
        baseline: "bare node:http req/s",
        ratio: rps(floorJson).median / bareRps.median,
      }),
      row({ group: "http", figure: "  empty Astro endpoint p99 latency", unit: "ms", stats: p99(floorJson) }),
      row({
        group: "http",
        figure: "  empty Astro endpoint CPU per request",
        unit: "ms",
        stats: cpu(floorJson),
        baseline: "bare node:http CPU per request",
        ratio: cpu(floorJson).median / bareCpu.median,
      }),
      row({
        group: "http",
        figure: "  empty Astro page throughput (floor)",
        unit: "req/s",
        stats: rps(floorPage),
        baseline: "bare node:http req/s",
        ratio: rps(floorPage).median / bareRps.median,
      }),
    ];
    emit(rows);
  } finally {
    for (const s of servers) s.kill("SIGTERM");
  }
});

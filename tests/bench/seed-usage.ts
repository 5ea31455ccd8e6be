/**
 * Bulk data for the usage benchmark, in the bench database only: 10 invented clients, 40
 * projects, 30 reagents with internal and external rates (one price change half-way), and
 * 1,000,000 ledger entries spread over two years, loaded with LOAD DATA LOCAL INFILE.
 *
 * Each project draws on its own handful of reagents, as a method's mobile phases do, so a
 * project-day has several entries per reagent (what a facility's ledger looks like).
 *
 * Run by `scripts/bench.mjs` (`tsx tests/bench/seed-usage.ts`); prints the period it filled as
 * `BENCH_SEED {...}`.
 */
import { once } from "node:events";
import { createWriteStream, mkdirSync, rmSync } from "node:fs";
import { join } from "node:path";
import mariadb from "mariadb";
import { reagents } from "../../src/lib/chem/index";
import { main } from "./lib";

const ENTRIES = Number(process.env.BENCH_LEDGER_ENTRIES ?? 1_000_000);
const CLIENTS = 10;
const PROJECTS = 40;
const REAGENTS = 30;
const DAYS = 730;
const FIRST_ID = 1000; // clients and projects above the demo data's ids

/** A small deterministic generator, so every run seeds the same ledger. */
function mulberry32(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const day = (d: Date) => d.toISOString().slice(0, 10);
const sqlTime = (ms: number) => new Date(ms).toISOString().slice(0, 23).replace("T", " ");

main(async () => {
  const conn = await mariadb.createConnection({
    host: process.env.DATABASE_HOST,
    port: Number(process.env.DATABASE_PORT),
    user: process.env.DATABASE_USER,
    password: process.env.DATABASE_PASSWORD,
    database: process.env.DATABASE_NAME,
    permitLocalInfile: true,
    timezone: "Z",
  });
  const random = mulberry32(20261201);
  const now = new Date();
  const end = Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), 1); // first day of this month, 00:00 UTC
  const start = end - DAYS * 86_400_000;
  const stamp = sqlTime(start);

  const picked = reagents.slice(0, REAGENTS);
  const streams = new Set((await conn.query("SELECT id FROM waste_streams")).map((r: { id: string }) => r.id));
  for (const r of picked) {
    if (!streams.has(r.wasteStream.value)) {
      await conn.query("INSERT IGNORE INTO waste_streams (id, name, restrictiveness, created_at, updated_at) VALUES (?, ?, 2, ?, ?)", [
        r.wasteStream.value,
        r.wasteStream.value,
        stamp,
        stamp,
      ]);
      streams.add(r.wasteStream.value);
    }
    await conn.query(
      "INSERT IGNORE INTO reagents (id, name, grades, unit, waste_stream_id, flammable, active, created_at, updated_at) VALUES (?, ?, '[]', ?, ?, ?, 1, ?, ?)",
      [r.id, r.name, r.form === "solid" ? "g" : "mL", r.wasteStream.value, r.flammable ? 1 : 0, stamp, stamp],
    );
  }

  const clients = Array.from({ length: CLIENTS }, (_, i) => ({
    id: FIRST_ID + i,
    name: `Bench client ${String(i + 1).padStart(2, "0")}`,
    kind: i % 2 === 0 ? "internal" : "external",
  }));
  await conn.batch(
    "INSERT INTO clients (id, name, kind, cost_centre, billing_email, currency, active, created_at, updated_at) VALUES (?, ?, ?, ?, ?, 'EUR', 1, ?, ?)",
    clients.map((c) => [
      c.id,
      c.name,
      c.kind,
      c.kind === "internal" ? `CC-B${c.id}` : null,
      c.kind === "external" ? `bench${c.id}@bench.test` : null,
      stamp,
      stamp,
    ]),
  );
  const projects = Array.from({ length: PROJECTS }, (_, i) => ({
    id: FIRST_ID + i,
    clientId: FIRST_ID + (i % CLIENTS),
    code: `BN${String((i % CLIENTS) + 1).padStart(2, "0")}-P${String(i + 1).padStart(3, "0")}`,
  }));
  await conn.batch(
    "INSERT INTO projects (id, code, name, client_id, status, created_at, updated_at) VALUES (?, ?, ?, ?, 'active', ?, ?)",
    projects.map((p) => [p.id, p.code, `Bench project ${p.code}`, p.clientId, stamp, stamp]),
  );

  // Two rates per reagent and price list: one in force from the start, one from half-way.
  const rateRows: unknown[][] = [];
  const halfway = day(new Date(start + (DAYS / 2) * 86_400_000));
  picked.forEach((r, i) => {
    const unit = r.form === "solid" ? "g" : "L";
    const base = unit === "g" ? 20 + i * 7 : 300 + i * 450;
    for (const list of ["internal", "external"] as const) {
      const factor = list === "external" ? 1.8 : 1;
      rateRows.push(["reagent", r.id, list, unit, Math.round(base * factor), day(new Date(start - 30 * 86_400_000)), stamp]);
      rateRows.push(["reagent", r.id, list, unit, Math.round(base * factor * 1.06), halfway, stamp]);
    }
  });
  await conn.batch(
    "INSERT INTO rates (kind, reagent_id, price_list, unit, amount_minor, currency, effective_from, created_at) VALUES (?, ?, ?, ?, ?, 'EUR', ?, ?)",
    rateRows,
  );

  // Each project uses 6 of the 30 reagents: two solvents, an additive or two, a buffer salt.
  const uses = projects.map((_, i) => Array.from({ length: 6 }, (_, k) => picked[(i * 5 + k * 7) % REAGENTS]!));
  // In files of 100,000 rows (about 10 MB): one LOAD DATA per file stays within the server's packet size.
  const dir = join(process.cwd(), ".data", "bench", "seed");
  mkdirSync(dir, { recursive: true });
  const CHUNK = 100_000;
  let writeMs = 0;
  let loadMs = 0;
  await conn.query("SET SESSION foreign_key_checks = 0, unique_checks = 0");
  for (let first = 0; first < ENTRIES; first += CHUNK) {
    const file = join(dir, `ledger-${first}.tsv`);
    const t0 = performance.now();
    const out = createWriteStream(file);
    for (let i = first; i < Math.min(ENTRIES, first + CHUNK); i++) {
      const p = Math.floor(random() * PROJECTS);
      const reagent = uses[p]![Math.floor(random() * 6)]!;
      const at = start + Math.floor(random() * DAYS * 86_400_000);
      const solid = reagent.form === "solid";
      const volume = solid ? (random() * 5).toFixed(4) : (5 + random() * 495).toFixed(4);
      const mass = solid ? (0.2 + random() * 9.8).toFixed(5) : "\\N";
      const line = `${sqlTime(at)}\t${FIRST_ID + p}\trun\t${reagent.id}\t${volume}\t${mass}\t${reagent.wasteStream.value}\tseed\tbench:${i}\t${stamp}\n`;
      if (!out.write(line)) await once(out, "drain");
    }
    out.end();
    await once(out, "finish");
    const t1 = performance.now();
    await conn.query(
      `LOAD DATA LOCAL INFILE ? INTO TABLE ledger_entries FIELDS TERMINATED BY '\\t' LINES TERMINATED BY '\\n'
         (occurred_at, project_id, kind, reagent_id, volume_ml, mass_g, waste_stream_id, source_kind, source_id, created_at)`,
      [file],
    );
    loadMs += performance.now() - t1;
    writeMs += t1 - t0;
    rmSync(file, { force: true });
  }
  await conn.query("SET SESSION foreign_key_checks = 1, unique_checks = 1");
  const t2 = performance.now();
  await conn.query("ANALYZE TABLE ledger_entries");
  loadMs += performance.now() - t2;
  const writeS = writeMs / 1000;
  const loadS = loadMs / 1000;
  await conn.end();
  console.log(
    `seed: ${ENTRIES.toLocaleString("en-GB")} ledger entries, ${PROJECTS} projects, ${CLIENTS} clients, ${REAGENTS} reagents; file ${writeS.toFixed(1)} s, load ${loadS.toFixed(1)} s`,
  );
  console.log(
    `BENCH_SEED ${JSON.stringify({ from: day(new Date(start)), to: day(new Date(end - 86_400_000)), entries: ENTRIES, loadS, writeS })}`,
  );
});

// A private instance of the built app for tests that send many writes or garbage (the fuzz, uploads,
// audit): its own database (migrated and seeded), its own upload folder and its own port, so whole-
// database checksums are exact while other test files run, nothing reaches the shared e2e data,
// and the test knows the server's pid (for its memory, through /proc).
import { spawn, type ChildProcess } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { QueryTypes, type Sequelize } from "sequelize";
import { afterAll, beforeAll } from "vitest";
import { appServerCommand } from "../../scripts/lib/app-server.mjs";
import { migrator, seeder } from "../../src/db/umzug";
import { createSequelize } from "../../src/lib/server/db";
import { testEnv } from "./database";
import { cookieClient, DEMO_PASSWORD, type Client } from "./http";
import { freePort } from "./ports";

export interface AppInstance {
  baseUrl: string;
  /** The app server's process id. */
  pid: number;
  /** A connection to the instance's database. */
  sequelize: Sequelize;
  databaseName: string;
  uploadDir: string;
  /** A cookie-keeping client of this instance; signed in when an e-mail is given. */
  client(email?: string, password?: string): Promise<Client>;
  /** The server's resident memory now, in MiB (from /proc/<pid>/status). */
  rss_MiB(): number;
  /** The last 4,000 characters the server printed: where a 500 says what went wrong. */
  recentOutput(): string;
}

export function clientOf(baseUrl: string) {
  return async (email?: string, password = DEMO_PASSWORD): Promise<Client> => {
    const c: Client = cookieClient(baseUrl);
    if (email) {
      const response = await c.fetch("/api/auth/sign-in", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ email, password }),
      });
      if (response.status !== 200) throw new Error(`sign-in as ${email} answered ${response.status}`);
    }
    return c;
  };
}

/** Starts the built app (DECANT_OUT_DIR, built by `npm test`) on a database of its own; `extraEnv` adds to its environment. */
export function useAppInstance(extraEnv: NodeJS.ProcessEnv = {}): AppInstance {
  const handle = {} as AppInstance;
  let child: ChildProcess | null = null;
  let output = "";
  beforeAll(async () => {
    const env = testEnv();
    const name = `decant_app_${process.env.VITEST_POOL_ID ?? "0"}_${Math.random().toString(36).slice(2, 8)}`;
    const admin = createSequelize(env);
    await admin.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    await admin.close();
    const sequelize = createSequelize({ ...env, DATABASE_NAME: name });
    await migrator(sequelize).up();
    await seeder(sequelize).up();
    const port = await freePort();
    const uploadDir = mkdtempSync(join(tmpdir(), "decant-uploads-"));
    const baseUrl = `http://127.0.0.1:${port}`;
    child = spawn(...appServerCommand(process.env.DECANT_OUT_DIR ?? "dist"), {
      // No scheduled jobs: they would write while a test compares the database before and after.
      env: {
        ...process.env,
        DATABASE_NAME: name,
        HOST: "127.0.0.1",
        PORT: String(port),
        APP_ORIGIN: baseUrl,
        UPLOAD_DIR: uploadDir,
        NODE_ENV: "production",
        DECANT_NO_SCHEDULE: "1",
        ...extraEnv,
      },
      stdio: ["ignore", "pipe", "pipe"],
    });
    child.stdout?.on("data", (d: Buffer) => (output = (output + d.toString()).slice(-4000)));
    child.stderr?.on("data", (d: Buffer) => (output = (output + d.toString()).slice(-4000)));
    const deadline = Date.now() + 30_000;
    for (;;) {
      if (child.exitCode !== null) throw new Error(`the app instance exited (${child.exitCode}):\n${output}`);
      const up = await fetch(`${baseUrl}/api/health`).then(
        (r) => r.status === 200,
        () => false,
      );
      if (up) break;
      if (Date.now() > deadline) throw new Error(`the app instance did not answer within 30 s:\n${output}`);
      await new Promise((r) => setTimeout(r, 150));
    }
    Object.assign(handle, {
      baseUrl,
      pid: child.pid!,
      sequelize,
      databaseName: name,
      uploadDir,
      client: clientOf(baseUrl),
      rss_MiB: () => rssOf(child!.pid!),
      recentOutput: () => output,
    });
  });
  afterAll(async () => {
    if (child && child.exitCode === null) {
      const exited = new Promise((r) => child!.once("exit", r));
      child.kill("SIGTERM");
      await Promise.race([exited, new Promise((r) => setTimeout(r, 5_000))]);
      if (child.exitCode === null) child.kill("SIGKILL");
    }
    if (handle.sequelize) {
      await handle.sequelize.query(`DROP DATABASE \`${handle.databaseName}\``);
      await handle.sequelize.close();
    }
    if (handle.uploadDir) rmSync(handle.uploadDir, { recursive: true, force: true });
  });
  return handle;
}

export function rssOf(pid: number): number {
  const status = readFileSync(`/proc/${pid}/status`, "utf8");
  const kb = Number(/VmRSS:\s+(\d+)/.exec(status)?.[1] ?? NaN);
  return kb / 1024;
}

/**
 * What every request may write by design, whatever its input: the per-user rate-limit buckets, and
 * a session's activity (last use and the deadline it moves; at most once a minute). Left out of
 * the fingerprint, so "nothing was written" means nothing the request asked for.
 */
const REQUEST_BOOKKEEPING: Record<string, string[] | "all"> = { rate_limit_buckets: "all", sessions: ["last_seen_at", "expires_at"] };

/** Row count and checksum of every table of a database (less REQUEST_BOOKKEEPING): equal before and after means nothing was written. */
export async function databaseFingerprint(sequelize: Sequelize): Promise<Record<string, string>> {
  const tables = (
    await sequelize.query<{ name: string }>(
      "SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE' ORDER BY table_name",
      { type: QueryTypes.SELECT },
    )
  )
    .map((t) => t.name)
    .filter((t) => REQUEST_BOOKKEEPING[t] !== "all");
  const sums = await sequelize.query<{ Table: string; Checksum: number | string | null }>(
    `CHECKSUM TABLE ${tables.map((t) => `\`${t}\``).join(", ")}`,
    { type: QueryTypes.SELECT },
  );
  const out: Record<string, string> = {};
  for (const t of tables) {
    const [{ n }] = (await sequelize.query<{ n: number }>(`SELECT COUNT(*) AS n FROM \`${t}\``, { type: QueryTypes.SELECT })) as [
      { n: number },
    ];
    let sum = sums.find((s) => s.Table.endsWith(`.${t}`))?.Checksum;
    const skip = REQUEST_BOOKKEEPING[t];
    if (Array.isArray(skip)) sum = await checksumWithout(sequelize, t, skip);
    out[t] = `${Number(n)} rows, checksum ${String(sum)}`;
  }
  return out;
}

/** A table's checksum over every column but `skip`. */
async function checksumWithout(sequelize: Sequelize, table: string, skip: string[]): Promise<string> {
  const columns = (
    await sequelize.query<{ name: string }>(
      "SELECT column_name AS name FROM information_schema.columns WHERE table_schema = DATABASE() AND table_name = :table ORDER BY ordinal_position",
      { type: QueryTypes.SELECT, replacements: { table } },
    )
  )
    .map((c) => c.name)
    .filter((c) => !skip.includes(c));
  const [row] = await sequelize.query<{ sum: string | number | null }>(
    `SELECT BIT_XOR(CRC32(CONCAT_WS('|', ${columns.map((c) => `COALESCE(\`${c}\`, 'NULL')`).join(", ")}))) AS sum FROM \`${table}\``,
    { type: QueryTypes.SELECT },
  );
  return String(row?.sum ?? 0);
}

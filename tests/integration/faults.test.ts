// Database faults, end to end: a stack of this file's own (a throwaway MariaDB, the payments and
// SMTP fakes, the built app as its own process) so the database can be stopped under the app
// without touching the shared test server. The database is killed in the middle of an import and
// shut down in the middle of an invoice run: each request answers 503 with a clear message,
// nothing is partly written, health says "down" then "up", the same request then succeeds once,
// and the app process lives through it all without a restart.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { appServerCommand } from "../../scripts/lib/app-server.mjs";
import { ensureAppUser, startMariadb } from "../../scripts/lib/mariadb.mjs";
import { migrator, seeder } from "../../src/db/umzug";
import { RUN_LOG_HEADER } from "../../src/lib/imports/run-log";
import { createSequelize } from "../../src/lib/server/db";
import { demoBatchCodes } from "../support/demo-batches";
import { freePort } from "../support/ports";

let codes: Record<number, string> = {};

const DAY = 86_400_000;
const DB = "decant_faults";

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function until<T>(
  what: string,
  probe: () => T | null | undefined | false | Promise<T | null | undefined | false>,
  timeoutMs = 20_000,
  everyMs = 50,
): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await sleep(everyMs);
  }
}

/** A child process whose output is kept (the tail is shown when a test fails). */
class Child {
  output = "";
  readonly process: ChildProcess;
  constructor(
    readonly name: string,
    command: string,
    args: string[],
    env: NodeJS.ProcessEnv,
  ) {
    this.process = spawn(command, args, { env, stdio: ["ignore", "pipe", "pipe"] });
    const keep = (chunk: Buffer) => {
      this.output = (this.output + chunk.toString()).slice(-20_000);
    };
    this.process.stdout!.on("data", keep);
    this.process.stderr!.on("data", keep);
  }
  get alive() {
    return this.process.exitCode === null && this.process.signalCode === null;
  }
  async stop() {
    if (!this.alive) return;
    const exited = new Promise((r) => this.process.once("exit", r));
    this.process.kill("SIGCONT");
    this.process.kill("SIGTERM");
    await Promise.race([exited, sleep(10_000)]);
    if (this.alive) this.process.kill("SIGKILL");
  }
}

/** A cookie-keeping client of this file's own app. */
function httpClient(base: string) {
  let cookie: string | null = null;
  return async (path: string, init: RequestInit = {}) => {
    const headers = new Headers(init.headers);
    if (cookie) headers.set("cookie", cookie);
    const response = await fetch(base + path, { ...init, headers, redirect: "manual" });
    const set = response.headers.get("set-cookie");
    if (set) cookie = set.split(";")[0] ?? null;
    return response;
  };
}
type Http = ReturnType<typeof httpClient>;

const dir = mkdtempSync(join(tmpdir(), "decant-faults-"));
const credentials = { database: DB, user: "decant", password: `faults-${randomBytes(8).toString("hex")}` };
let dbPort = 0;
let server: Awaited<ReturnType<typeof startMariadb>> | null = null;
const children: Child[] = [];
let app: Child;
let payments: Child;
let base = "";
let paymentsBase = "";
let tech: Http;
let manager: Http;
let faultsSurvived = 0;

/** SQL as the server's root over its socket, independent of the app and its pool; never waits long. */
function sql(query: string): string {
  const r = spawnSync(
    server!.bins.client!,
    [
      "--no-defaults",
      `--socket=${server!.paths.socket}`,
      "-uroot",
      "--batch",
      "--skip-column-names",
      "-e",
      `SET SESSION lock_wait_timeout = 5; ${query}`,
    ],
    { encoding: "utf8", timeout: 15_000 },
  );
  if (r.status !== 0) throw new Error(`SQL failed (${r.error?.message ?? r.status}): ${r.stderr}`);
  return r.stdout;
}

/** One line of figures, read beside the app. */
function figures() {
  const [runs, ledger, imports, audit, remaining, invoices, locks, statements, customer] = sql(
    `SELECT (SELECT COUNT(*) FROM ${DB}.runs), (SELECT COUNT(*) FROM ${DB}.ledger_entries), (SELECT COUNT(*) FROM ${DB}.imports),
              (SELECT COUNT(*) FROM ${DB}.audit_log), (SELECT SUM(remaining_ml) FROM ${DB}.batches), (SELECT COUNT(*) FROM ${DB}.invoices),
              (SELECT COUNT(*) FROM ${DB}.period_locks), (SELECT GROUP_CONCAT(CONCAT(id, ':', status) ORDER BY id) FROM ${DB}.statements),
              (SELECT COALESCE(payments_customer_id, '-') FROM ${DB}.clients WHERE id = 4)`,
  )
    .trim()
    .split("\t");
  return {
    runs: Number(runs),
    ledger: Number(ledger),
    imports: Number(imports),
    audit: Number(audit),
    remaining_mL: Number(remaining),
    invoices: Number(invoices),
    periodLocks: Number(locks),
    statements,
    customer,
  };
}

/** The app's transaction that has written rows and not committed, with what its connection is doing. */
function openAppTransaction(): { rows: number; command: string; state: string; query: string } | null {
  // Row changes the app has made and not committed: what a dirty read sees beyond a committed one.
  const counts = (isolation: string) =>
    sql(
      `SET SESSION TRANSACTION ISOLATION LEVEL ${isolation};
       SELECT (SELECT COUNT(*) FROM ${DB}.runs) + (SELECT COUNT(*) FROM ${DB}.ledger_entries) + (SELECT COUNT(*) FROM ${DB}.imports)
            + (SELECT COUNT(*) FROM ${DB}.invoices) + (SELECT COUNT(*) FROM ${DB}.period_locks) + (SELECT COUNT(*) FROM ${DB}.statements WHERE status <> 'draft')`,
    ).trim();
  const rows = Number(counts("READ UNCOMMITTED")) - Number(counts("READ COMMITTED"));
  if (!(rows > 0)) return null;
  const line = sql(
    `SELECT command, COALESCE(state, ''), LEFT(COALESCE(info, ''), 24) FROM information_schema.processlist
      WHERE user = '${credentials.user}' ORDER BY (command <> 'Sleep') DESC, time DESC LIMIT 1`,
  ).trim();
  const [command, state, query] = line.split("\t");
  return { rows, command: command ?? "", state: state ?? "", query: query ?? "" };
}

async function health() {
  const response = await fetch(`${base}/api/health`);
  return { status: response.status, body: (await response.json()) as { ok: boolean; db: string } };
}

async function restartDatabase() {
  server = await startMariadb({ dataDir: join(dir, "mariadb"), port: dbPort });
}

/** Each test starts with the database up, even when the one before failed half-way. */
async function databaseUp() {
  try {
    sql("SELECT 1");
  } catch {
    await restartDatabase();
  }
}

beforeAll(async () => {
  const outDir = resolve(process.env.DECANT_OUT_DIR ?? "dist");
  const entry = join(outDir, "server", "entry.mjs");
  if (!existsSync(entry)) throw new Error(`${entry} is missing: run this through \`npm test\`, which builds the app first.`);
  dbPort = await freePort();
  const [appPort, paymentsPort, smtpPort] = [await freePort(), await freePort(), await freePort()];
  paymentsBase = `http://127.0.0.1:${paymentsPort}`;
  server = await startMariadb({ dataDir: join(dir, "mariadb"), port: dbPort });
  ensureAppUser(server, credentials);
  const sequelize = createSequelize({
    DATABASE_HOST: "127.0.0.1",
    DATABASE_PORT: dbPort,
    DATABASE_NAME: DB,
    DATABASE_USER: credentials.user,
    DATABASE_PASSWORD: credentials.password,
  });
  await migrator(sequelize).up();
  await seeder(sequelize).up();
  codes = await demoBatchCodes(sequelize);
  await sequelize.close();

  base = `http://127.0.0.1:${appPort}`;
  mkdirSync(join(dir, "mailbox"), { recursive: true });
  const env: NodeJS.ProcessEnv = {
    PATH: process.env.PATH,
    NODE_ENV: "production",
    DATABASE_HOST: "127.0.0.1",
    DATABASE_PORT: String(dbPort),
    DATABASE_NAME: DB,
    DATABASE_USER: credentials.user,
    DATABASE_PASSWORD: credentials.password,
    SESSION_SECRET: randomBytes(32).toString("base64url"),
    HOST: "127.0.0.1",
    PORT: String(appPort),
    APP_ORIGIN: base,
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(smtpPort),
    SMTP_FAKE_MAILBOX: join(dir, "mailbox"),
    MAIL_FROM: "Decant <decant@facility.test>",
    PAYMENTS_HOST: "127.0.0.1",
    PAYMENTS_PORT: String(paymentsPort),
    PAYMENTS_PROTOCOL: "http",
    PAYMENTS_SECRET_KEY: `sk_test_${randomBytes(12).toString("hex")}`,
    PAYMENTS_WEBHOOK_SECRET: `whsec_${randomBytes(16).toString("hex")}`,
    PAYMENTS_WEBHOOK_URL: `${base}/api/webhooks/payments`,
    PAYMENTS_FAKE_STATE: join(dir, "payments", "state.json"),
    UPLOAD_DIR: join(dir, "uploads"),
  };
  // The fakes run in one process each (node --import tsx), so SIGSTOP pauses exactly the fake.
  payments = new Child("payments fake", process.execPath, ["--import", "tsx", "fakes/payments/server.ts"], {
    ...env,
    FAKE_PORT: String(paymentsPort),
  });
  const smtp = new Child("smtp fake", process.execPath, ["--import", "tsx", "fakes/smtp/server.ts"], {
    ...env,
    FAKE_PORT: String(smtpPort),
  });
  app = new Child("app", ...appServerCommand(outDir), env);
  children.push(payments, smtp, app);
  await until(
    "the fakes",
    async () =>
      (await fetch(`${paymentsBase}/_fake/health`).then(
        (r) => r.ok,
        () => false,
      )) &&
      payments.alive &&
      smtp.alive,
    30_000,
    200,
  );
  await until(
    "the app",
    async () =>
      (await health().then(
        (h) => h.status === 200,
        () => false,
      )) ||
      (!app.alive && Promise.reject(new Error(`the app exited:\n${app.output}`))),
    30_000,
    200,
  );

  const signIn = async (email: string) => {
    const c = httpClient(base);
    const r = await c("/api/auth/sign-in", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ email, password: "decant-demo" }),
    });
    if (r.status !== 200) throw new Error(`sign-in as ${email} answered ${r.status}`);
    return c;
  };
  tech = await signIn("tech@demo.test");
  manager = await signIn("manager@demo.test");
}, 180_000);

afterAll(async () => {
  for (const child of [...children].reverse()) await child.stop();
  await server?.stop();
  rmSync(dir, { recursive: true, force: true });
  console.log(
    `database faults: ${faultsSurvived} of 2 survived by one app process without a restart (each with 0 rows lost or half-written)`,
  );
});

/** The app's output, for a failing expectation's message. */
const appLog = () => `app output:\n${app.output.slice(-4_000)}`;

describe("the database stops under the app", () => {
  const rows = 300;
  const file = () => {
    const line = (i: number) => {
      const values: Record<string, string> = {
        run_reference: `FAULT-${String(i).padStart(4, "0")}`,
        instrument: "Wren",
        method: "Scout gradient 5–95 % B, 12 min",
        project: "PMG-ROOT-26",
        started_at: new Date(Date.now() - 2 * DAY + i * 300_000).toISOString().slice(0, 16),
        injections: "1",
        batch_A: codes[4]!,
        batch_B: codes[5]!,
      };
      return RUN_LOG_HEADER.map((c) => (values[c]?.includes(",") ? `"${values[c]}"` : (values[c] ?? ""))).join(",");
    };
    return `${RUN_LOG_HEADER.join(",")}\r\n${Array.from({ length: rows }, (_, i) => line(i)).join("\r\n")}\r\n`;
  };
  const commit = (content: string) =>
    tech("/api/imports?mode=commit&fileName=faults.csv", { method: "POST", headers: { "content-type": "text/csv" }, body: content });

  it(`mariadbd killed (SIGKILL) in the middle of committing a ${rows}-run import: 503, nothing written, then the same file imports once`, async () => {
    await databaseUp();
    const content = file();
    const before = figures();

    // Hold the audit log so the import's transaction stops just before its last write, with its runs,
    // ledger entries and batch volumes written but not committed; then kill the server under it.
    const holder = spawn(
      server!.bins.client!,
      ["--no-defaults", `--socket=${server!.paths.socket}`, "-uroot", "--batch", "--skip-column-names", "--unbuffered", DB],
      { stdio: ["pipe", "pipe", "ignore"] },
    );
    let open!: NonNullable<ReturnType<typeof openAppTransaction>>;
    let pending!: Promise<Response | Error>;
    try {
      let held = "";
      holder.stdout!.on("data", (c) => (held += c));
      holder.stdin!.write("LOCK TABLES audit_log WRITE;\nSELECT 'held';\n");
      await until("the audit log lock", () => held.includes("held"));
      let early: Error | null = null;
      let faulted = false;
      pending = commit(content).catch((error: Error) => error);
      void pending.then(async (r) => {
        if (!faulted) early = r instanceof Response ? new Error(`${r.status} ${await r.text()}`) : r;
      });
      open = await until("the import's open transaction", () => {
        if (early) throw new Error(`the import answered before the fault: ${(early as Error).message.slice(0, 2_000)}\n${appLog()}`);
        const trx = openAppTransaction();
        return trx && /Waiting for table (metadata|level) lock/i.test(trx.state) ? trx : null;
      });
      expect(open.rows, "rows written by the import before the fault").toBeGreaterThan(0);
      faulted = true;
      process.kill(server!.pid, "SIGKILL");
      await until("mariadbd to exit", () => {
        try {
          process.kill(server!.pid, 0);
          return false;
        } catch {
          return true;
        }
      });
    } finally {
      holder.kill("SIGKILL");
    }

    const failed = (await pending) as Response;
    expect(failed).toBeInstanceOf(Response);
    expect(failed.status, appLog()).toBe(503);
    expect(failed.headers.get("retry-after")).toBe("5");
    expect(((await failed.json()) as { error: string }).error).toBe("The database is unavailable; try again in a moment.");
    expect(await health()).toEqual({ status: 503, body: { ok: false, db: "down" } });
    // While it is down, a new attempt answers at once, the same way.
    const started = Date.now();
    const whileDown = await commit(content);
    expect(whileDown.status).toBe(503);
    expect(Date.now() - started).toBeLessThan(15_000);

    await restartDatabase();
    // Crash recovery rolled the open transaction back: the database is as it was before the upload.
    expect(figures()).toEqual(before);
    expect((await health()).body).toEqual({ ok: true, db: "up" });

    const done = await commit(content);
    expect(done.status, appLog()).toBe(201);
    const report = (await done.json()) as { newRuns: number; entries: number; alreadyRecorded: number };
    expect(report).toMatchObject({ newRuns: rows, alreadyRecorded: 0 });
    const after = figures();
    expect(after.runs - before.runs).toBe(rows);
    expect(after.imports - before.imports).toBe(1);
    expect(after.ledger - before.ledger).toBe(report.entries);
    expect(after.remaining_mL).toBeLessThan(before.remaining_mL);

    // Once: the same file again records nothing new.
    const again = await commit(content);
    expect(again.status).toBe(201);
    expect(await again.json()).toMatchObject({ newRuns: 0, alreadyRecorded: rows });
    expect(figures().runs).toBe(after.runs);
    expect(app.alive, appLog()).toBe(true);
    faultsSurvived++;
    console.log(
      `import fault: the import's transaction had ${open.rows} row changes uncommitted (its runs, ledger entries and batch volumes; ${open.state.toLowerCase()} at "${open.query}…") when mariadbd was killed; after crash recovery 0 were left; the retry wrote ${rows} runs and ${report.entries} ledger entries, once`,
    );
  }, 120_000);

  it("mariadbd shut down (SIGTERM) in the middle of an invoice run: 503, nothing written, then one invoice at the provider and in Decant", async () => {
    await databaseUp();
    const now = new Date();
    const month = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 1, 1));
    const periodStart = month.toISOString().slice(0, 10);
    const periodEnd = new Date(Date.UTC(month.getUTCFullYear(), month.getUTCMonth() + 1, 0)).toISOString().slice(0, 10);
    const opened = await manager("/api/statements", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ clientId: 4, periodStart, periodEnd }),
    });
    expect(opened.status, appLog()).toBe(201);
    const { id } = (await opened.json()) as { id: number };
    const draft = (await (await manager(`/api/statements/${id}`)).json()) as { total_minor: number; blocker: string | null };
    expect(draft.blocker).toBeNull();
    expect(draft.total_minor).toBeGreaterThan(0);
    const send = () =>
      manager(`/api/statements/${id}/invoice`, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ expectedTotal_minor: draft.total_minor }),
      });
    const before = figures();

    // Pause the payments service so the run waits on it with its writes (statement issued, period
    // locked, invoice row) open; then shut the database down and let the payments service go on.
    process.kill(payments.process.pid!, "SIGSTOP");
    let pending!: Promise<Response>;
    let open!: NonNullable<ReturnType<typeof openAppTransaction>>;
    try {
      pending = send();
      let early: Response | null = null;
      void pending.then(
        (r) => (early = r),
        () => undefined,
      );
      open = await until("the invoice run's open transaction", () => {
        if (early) throw new Error(`the invoice run answered before the fault: ${(early as Response).status}\n${appLog()}`);
        const trx = openAppTransaction();
        return trx && trx.rows > 0 && trx.command === "Sleep" ? trx : null;
      });
      await server!.stop();
    } finally {
      process.kill(payments.process.pid!, "SIGCONT");
    }
    const failed = await pending;
    expect(failed.status, appLog()).toBe(503);
    expect(((await failed.json()) as { error: string }).error).toBe("The database is unavailable; try again in a moment.");
    expect(await health()).toEqual({ status: 503, body: { ok: false, db: "down" } });

    await restartDatabase();
    const restored = figures();
    expect(restored).toEqual(before);
    expect(restored.statements).toContain(`${id}:draft`);
    expect((await health()).body).toEqual({ ok: true, db: "up" });

    const sent = await send();
    expect(sent.status, appLog()).toBe(201);
    const { invoice } = (await sent.json()) as { invoice: { id: number; status: string; providerInvoiceId: string } };
    expect(invoice.status).toBe("open");
    const repeat = await send();
    expect(repeat.status).toBe(200);
    expect(((await repeat.json()) as { invoice: { id: number } }).invoice.id).toBe(invoice.id);
    const after = figures();
    expect(after.invoices - before.invoices).toBe(1);
    expect(after.periodLocks - before.periodLocks).toBe(1);
    // The first attempt's provider calls and the retry's share idempotency keys: one invoice there too.
    const atProvider = (await (await fetch(`${paymentsBase}/_fake/invoices?metadata[decant_statement_id]=${id}`)).json()) as {
      data: { id: string; status: string }[];
    };
    expect(atProvider.data.map((i) => i.id)).toEqual([invoice.providerInvoiceId]);
    expect(app.alive, appLog()).toBe(true);
    faultsSurvived++;
    console.log(
      `invoice fault: ${open!.rows} rows written and not committed when mariadbd shut down; after restart 0 were left; the retry sent 1 invoice (${atProvider.data.length} at the provider)`,
    );
  }, 120_000);
});

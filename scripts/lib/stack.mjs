// Brings up what the app needs — private MariaDB, schema, fakes — for `npm start` and `npm test`.
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readdirSync } from "node:fs";
import { join, resolve } from "node:path";
import { startMariadb, ensureAppUser } from "./mariadb.mjs";
import { ROOT, DATA_DIR, bin, fail, localEnv, portAnswers, portIsFree, run, waitFor } from "./util.mjs";

/** Profiles keep the demo data and the test data in separate servers. */
export const PROFILES = {
  dev: { dir: join(DATA_DIR, "dev"), dbPort: 3307, database: "decant", smtpPort: 2525, paymentsPort: 12111 },
  test: {
    dir: process.env.DECANT_TEST_DATA_DIR ? resolve(process.env.DECANT_TEST_DATA_DIR) : join(DATA_DIR, "test"),
    dbPort: 3317,
    database: "decant_e2e",
    smtpPort: 2535,
    paymentsPort: 12121,
  },
  // `npm run bench`: a server of its own, so a million benchmark ledger entries never meet the demo or test data.
  bench: { dir: join(DATA_DIR, "bench"), dbPort: 3327, database: "decant_bench", smtpPort: 2545, paymentsPort: 12131, appPort: 4341 },
};

/** The variables that override a profile's database and app ports. */
const PORT_VARIABLES = {
  dev: { db: "DECANT_DB_PORT", app: "PORT" },
  test: { db: "DECANT_TEST_DB_PORT", app: "DECANT_TEST_APP_PORT" },
  bench: { db: "DECANT_BENCH_DB_PORT", app: "DECANT_BENCH_APP_PORT" },
};

const intFromEnv = (name, fallback) => {
  const raw = process.env[name];
  if (raw === undefined || raw === "") return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1 || n > 65535) fail(`${name} must be a port number (1–65535), got "${raw}".`);
  return n;
};

/**
 * Starts the private database for a profile and returns the environment the app and tools need.
 * @param {"dev" | "test" | "bench"} profileName
 */
export async function startDatabase(profileName) {
  const profile = PROFILES[profileName];
  const portVariable = PORT_VARIABLES[profileName].db;
  const dbPort = intFromEnv(portVariable, profile.dbPort);
  const server = await startMariadb({ dataDir: join(profile.dir, "mariadb"), port: dbPort, portVariable });
  const mailbox = join(profile.dir, "mailbox");
  const uploads = join(profile.dir, "uploads");
  mkdirSync(mailbox, { recursive: true });
  mkdirSync(uploads, { recursive: true });
  const local = localEnv(join(profile.dir, "decant.env"), {
    DATABASE_HOST: "127.0.0.1",
    DATABASE_USER: "decant",
    // Test keys for the payments fake; the same file points Decant at the real service instead.
    PAYMENTS_SECRET_KEY: `sk_test_${randomBytes(18).toString("hex")}`,
    PAYMENTS_WEBHOOK_SECRET: `whsec_${randomBytes(24).toString("hex")}`,
  });
  // The fake posts its signed events to the app's webhook route.
  const appPort = process.env[PORT_VARIABLES[profileName].app] || { dev: 4321, test: 4331, bench: profile.appPort }[profileName];
  const env = {
    DATABASE_HOST: "127.0.0.1",
    DATABASE_PORT: String(dbPort),
    DATABASE_NAME: profile.database,
    DATABASE_USER: local.DATABASE_USER,
    DATABASE_PASSWORD: local.DATABASE_PASSWORD,
    SESSION_SECRET: local.SESSION_SECRET,
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(intFromEnv("DECANT_SMTP_PORT", profile.smtpPort)),
    SMTP_FAKE_MAILBOX: mailbox,
    MAIL_FROM: "Decant <decant@facility.test>",
    PAYMENTS_HOST: "127.0.0.1",
    PAYMENTS_PORT: String(intFromEnv("DECANT_PAYMENTS_PORT", profile.paymentsPort)),
    PAYMENTS_PROTOCOL: "http",
    PAYMENTS_SECRET_KEY: local.PAYMENTS_SECRET_KEY,
    PAYMENTS_WEBHOOK_SECRET: local.PAYMENTS_WEBHOOK_SECRET,
    PAYMENTS_WEBHOOK_URL: `http://127.0.0.1:${appPort}/api/webhooks/payments`,
    PAYMENTS_FAKE_STATE: join(profile.dir, "payments", "state.json"),
    UPLOAD_DIR: uploads,
  };
  ensureAppUser(server, { database: env.DATABASE_NAME, user: env.DATABASE_USER, password: env.DATABASE_PASSWORD });
  return { server, env, profile };
}

/** Runs the umzug migrations (and, with seed, the demo seeders once; with year, the demo year too). */
export async function migrate(env, { seed, year = false }) {
  const args = [join(ROOT, "src/db/cli.ts"), seed ? "setup" : "migrate", ...(year ? ["--demo-year"] : [])];
  const code = await run(bin("tsx"), args, { env: { ...process.env, ...env } });
  if (code !== 0) throw new Error("Database migration failed; see the output above.");
}

/** Starts every fake under fakes/ that has a server.ts, each on loopback, and waits until it listens. */
export async function startFakes(group, env) {
  const ports = { smtp: Number(env.SMTP_PORT), payments: Number(env.PAYMENTS_PORT) };
  const fakes = join(ROOT, "fakes");
  for (const name of existsSync(fakes) ? readdirSync(fakes) : []) {
    const entry = join(ROOT, "fakes", name, "server.ts");
    if (!existsSync(entry)) continue;
    const port = ports[name];
    if (!port) continue;
    if (!(await portIsFree(port)))
      fail(`Port ${port} for the ${name} fake is taken; set DECANT_${name.toUpperCase()}_PORT to a free port.`);
    group.spawn(`${name} fake`, bin("tsx"), [entry], { env: { ...process.env, ...env, FAKE_PORT: String(port) } });
    try {
      await waitFor(() => portAnswers(port), 20_000, 100);
    } catch {
      fail(`The ${name} fake did not start listening on 127.0.0.1:${port}.`);
    }
  }
}

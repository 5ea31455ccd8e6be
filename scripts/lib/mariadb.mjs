// A private MariaDB server for Decant: own data directory, port, socket and pid file.
// Node built-ins only: this runs before node_modules exists.
import { spawn, spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, rmSync } from "node:fs";
import { userInfo } from "node:os";
import { join } from "node:path";
import { isRoot, log, fail, findExecutable, portIsFree, waitFor } from "./util.mjs";

const SEARCH_DIRS = ["/usr/sbin", "/usr/bin", "/usr/local/sbin", "/usr/local/bin", "/usr/libexec"];

export function mariadbBinaries() {
  const server = findExecutable("mariadbd", SEARCH_DIRS);
  return {
    server,
    installDb: findExecutable("mariadb-install-db", SEARCH_DIRS),
    client: findExecutable("mariadb", SEARCH_DIRS),
    admin: findExecutable("mariadb-admin", SEARCH_DIRS),
  };
}

/** Finds mariadbd; installs Debian's mariadb-server when missing and running as root. */
export function ensureMariadbInstalled() {
  let bins = mariadbBinaries();
  if (bins.server && bins.installDb && bins.client) return bins;
  const command = "apt-get update && apt-get install -y mariadb-server";
  if (!isRoot()) {
    fail(`MariaDB is not installed. Install it with:\n  sudo sh -c '${command}'`);
  }
  log("MariaDB not found; installing Debian's mariadb-server (apt-get)…");
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  for (const args of [["update"], ["install", "-y", "--no-install-recommends", "mariadb-server", "mariadb-client"]]) {
    const r = spawnSync("apt-get", args, { stdio: "inherit", env });
    if (r.status !== 0) fail(`apt-get ${args.join(" ")} failed (exit ${r.status}); run: ${command}`);
  }
  bins = mariadbBinaries();
  if (!bins.server) fail("mariadb-server was installed but mariadbd is still not on the PATH.");
  return bins;
}

/**
 * @typedef {object} ServerOptions
 * @property {string} dataDir   directory that holds data/, the socket, pid file and log
 * @property {number} port      TCP port on 127.0.0.1
 * @property {string} [portVariable] the environment variable that overrides the port, named in errors
 */

/** Paths of one private server. */
export function serverPaths(dataDir) {
  return {
    dataDir,
    data: join(dataDir, "data"),
    socket: join(dataDir, "mariadb.sock"),
    pidFile: join(dataDir, "mariadb.pid"),
    logFile: join(dataDir, "mariadb.log"),
    // Its own temporary directory: a shared /tmp being tidied would break queries that sort on disk.
    tmp: join(dataDir, "tmp"),
  };
}

function initialise(bins, paths) {
  if (existsSync(join(paths.data, "mysql"))) return false;
  rmSync(paths.data, { recursive: true, force: true });
  mkdirSync(paths.data, { recursive: true });
  log(`Initialising a private MariaDB data directory in ${paths.data}…`);
  const args = [
    "--no-defaults",
    `--datadir=${paths.data}`,
    "--auth-root-authentication-method=socket",
    `--auth-root-socket-user=${userInfo().username}`,
    "--skip-test-db",
  ];
  if (isRoot()) args.push("--user=root");
  const r = spawnSync(bins.installDb, args, { encoding: "utf8" });
  if (r.status !== 0) {
    rmSync(paths.data, { recursive: true, force: true });
    fail(`mariadb-install-db failed:\n${r.stdout}\n${r.stderr}`);
  }
  return true;
}

/** The pid in a pid file while that process lives, else null. */
export function livePid(pidFile) {
  if (!existsSync(pidFile)) return null;
  const pid = Number(readFileSync(pidFile, "utf8").trim());
  if (!Number.isInteger(pid) || pid <= 0) return null;
  try {
    process.kill(pid, 0);
    return pid;
  } catch {
    return null;
  }
}

async function waitForExit(pid, timeoutMs) {
  await waitFor(
    () => {
      try {
        process.kill(pid, 0);
        return false;
      } catch {
        return true;
      }
    },
    timeoutMs,
    100,
  );
}

/** Runs SQL as the socket-authenticated root of the private server. */
export function rootSql(bins, paths, sql) {
  const r = spawnSync(bins.client, ["--no-defaults", `--socket=${paths.socket}`, "-uroot", "--batch", "--skip-column-names", "-e", sql], {
    encoding: "utf8",
  });
  if (r.status !== 0) throw new Error(`SQL failed: ${r.stderr.trim()}`);
  return r.stdout;
}

/**
 * Starts the private server (initialising it on first use) and resolves once it answers.
 * Returns a handle whose stop() shuts mariadbd down gracefully.
 * @param {ServerOptions} options
 */
export async function startMariadb({ dataDir, port, portVariable = "DECANT_DB_PORT" }) {
  const bins = ensureMariadbInstalled();
  const paths = serverPaths(dataDir);
  mkdirSync(dataDir, { recursive: true });
  mkdirSync(paths.tmp, { recursive: true });
  initialise(bins, paths);

  // A server left behind by a killed run of ours: stop it, then start afresh under our control.
  const stale = livePid(paths.pidFile);
  if (stale) {
    log(`Stopping a private MariaDB left running (pid ${stale})…`);
    process.kill(stale, "SIGTERM");
    await waitForExit(stale, 60_000);
  }
  if (!(await portIsFree(port)))
    fail(`Port ${port} on 127.0.0.1 is taken, so the private MariaDB cannot start. Set ${portVariable} to a free port.`);

  const args = [
    "--no-defaults",
    `--datadir=${paths.data}`,
    `--port=${port}`,
    "--bind-address=127.0.0.1",
    `--socket=${paths.socket}`,
    `--pid-file=${paths.pidFile}`,
    `--log-error=${paths.logFile}`,
    `--tmpdir=${paths.tmp}`,
    "--skip-name-resolve",
    "--character-set-server=utf8mb4",
    "--collation-server=utf8mb4_unicode_ci",
    "--innodb-buffer-pool-size=256M",
    "--max-connections=300",
    "--local-infile=1",
  ];
  if (isRoot()) args.push("--user=root");
  const child = spawn(bins.server, args, { stdio: "ignore", detached: true });
  let exited = false;
  let exitCode = null;
  child.on("exit", (code) => {
    exited = true;
    exitCode = code;
  });

  try {
    await waitFor(
      () => {
        if (exited) throw new Error("exited");
        const r = spawnSync(bins.client, ["--no-defaults", `--socket=${paths.socket}`, "-uroot", "-e", "SELECT 1"], { stdio: "ignore" });
        return r.status === 0;
      },
      60_000,
      250,
    );
  } catch {
    const tail = existsSync(paths.logFile) ? readFileSync(paths.logFile, "utf8").trim().split("\n").slice(-3).join(" | ") : "";
    const portHint = /Address already in use|Can't start server: Bind/.test(tail)
      ? ` Port ${port} is taken; set ${portVariable} to another port.`
      : "";
    if (!exited) child.kill("SIGKILL");
    fail(`MariaDB failed to start (exit ${exitCode ?? "timeout"}).${portHint} Log: ${paths.logFile}${tail ? `\n  ${tail}` : ""}`);
  }

  return {
    bins,
    paths,
    port,
    pid: child.pid,
    sql: (sql) => rootSql(bins, paths, sql),
    async stop() {
      if (exited) return;
      child.kill("SIGTERM");
      await waitForExit(child.pid, 60_000);
    },
  };
}

/** Creates the database and an application user that may use every `decant…` database. */
export function ensureAppUser(server, { database, user, password }) {
  const esc = (s) => s.replace(/\\/g, "\\\\").replace(/'/g, "\\'");
  server.sql(
    [
      `CREATE DATABASE IF NOT EXISTS \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
      `CREATE USER IF NOT EXISTS '${esc(user)}'@'127.0.0.1' IDENTIFIED BY '${esc(password)}'`,
      `ALTER USER '${esc(user)}'@'127.0.0.1' IDENTIFIED BY '${esc(password)}'`,
      `GRANT ALL PRIVILEGES ON \`decant%\`.* TO '${esc(user)}'@'127.0.0.1'`,
      "FLUSH PRIVILEGES",
    ].join(";\n"),
  );
}

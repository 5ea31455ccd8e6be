// Backup and restore of one profile's private database and uploaded files, for `npm run backup`
// and `npm run restore`. Node built-ins plus the MariaDB client tools and the system `tar`.
//
// Archive format (`decant-<profile>-<UTC time>.tar.gz` under .data/backups/, gzip-compressed tar):
//   manifest.json   { format: "decant-backup/1", createdAt, profile, database, server, dump: { file, bytes, sha256 },
//                     uploads: [{ path, bytes, sha256 }] }
//   database.sql    mariadb-dump --single-transaction of the one database: schema, rows, triggers, routines
//                   (no CREATE DATABASE, so it loads into any database name)
//   uploads/        the files under UPLOAD_DIR, as they were after the dump was taken
import { spawn, spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import {
  cpSync,
  createReadStream,
  createWriteStream,
  existsSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  renameSync,
  rmSync,
  statSync,
  writeFileSync,
} from "node:fs";
import { tmpdir } from "node:os";
import { join, relative, resolve, sep } from "node:path";
import { Transform } from "node:stream";
import { pipeline } from "node:stream/promises";
import { ensureMariadbInstalled, livePid, rootSql, serverPaths, startMariadb } from "./mariadb.mjs";
import { PROFILES } from "./stack.mjs";
import { DATA_DIR, findExecutable } from "./util.mjs";

export const FORMAT = "decant-backup/1";

export class BackupError extends Error {}

const SEARCH_DIRS = ["/usr/bin", "/usr/local/bin", "/usr/sbin"];

function usagePort(raw, name) {
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1 || n > 65535) throw new BackupError(`${name} must be a port number (1–65535), got "${raw}".`);
  return n;
}

/**
 * Which server, database and upload folder a command works on. `--profile dev|test|…` picks a
 * profile of scripts/lib/stack.mjs (dev by default); `--dir` (a folder laid out like `.data/dev`:
 * mariadb/, uploads/), `--port`, `--database`, `--uploads` and `--out` override its parts, so a
 * test can point the scripts at a throwaway server.
 */
export function parseTarget(argv) {
  const options = {};
  const positional = [];
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    const m = /^--([a-z-]+)(?:=(.*))?$/.exec(arg);
    if (!m) {
      positional.push(arg);
      continue;
    }
    const value = m[2] ?? argv[++i];
    if (value === undefined) throw new BackupError(`--${m[1]} needs a value.`);
    options[m[1]] = value;
  }
  const known = new Set(["profile", "dir", "port", "database", "uploads", "out"]);
  for (const key of Object.keys(options)) if (!known.has(key)) throw new BackupError(`Unknown option --${key}.`);
  const profileName = options.profile ?? "dev";
  const profile = PROFILES[profileName];
  if (!profile) throw new BackupError(`No profile "${profileName}"; use one of ${Object.keys(PROFILES).join(", ")}.`);
  const dir = options.dir ? resolve(options.dir) : profile.dir;
  const portVariable = profileName === "dev" ? "DECANT_DB_PORT" : `DECANT_${profileName.toUpperCase()}_DB_PORT`;
  const rawPort = options.port ?? process.env[portVariable];
  const port = rawPort ? usagePort(rawPort, options.port ? "--port" : portVariable) : options.dir ? null : profile.dbPort;
  const database = options.database ?? profile.database;
  if (!/^[A-Za-z0-9_]+$/.test(database)) throw new BackupError(`--database may hold letters, digits and _ only, got "${database}".`);
  return {
    profileName,
    /** Names the archives: the profile, or the database when --dir points elsewhere. */
    name: options.dir ? database : profileName,
    dir,
    port,
    portVariable,
    database,
    uploads: options.uploads ? resolve(options.uploads) : join(dir, "uploads"),
    out: options.out ? resolve(options.out) : options.dir ? join(dir, "backups") : join(DATA_DIR, "backups"),
    positional,
  };
}

function tools() {
  const bins = ensureMariadbInstalled();
  const dump = findExecutable("mariadb-dump", SEARCH_DIRS) ?? findExecutable("mysqldump", SEARCH_DIRS);
  const tar = findExecutable("tar", SEARCH_DIRS);
  if (!dump)
    throw new BackupError("mariadb-dump is missing; it comes with Debian's mariadb-client package (apt-get install mariadb-client).");
  if (!tar) throw new BackupError("tar is missing; install Debian's tar package.");
  return { ...bins, dump, tar };
}

/**
 * Runs `work` against the profile's private server. A server that is already running (`npm start`,
 * a test) is used as it is and left running; otherwise it is started for the command and stopped
 * afterwards. Nothing else is ever stopped.
 */
export async function withServer(target, work, { mustExist = true } = {}) {
  const dataDir = join(target.dir, "mariadb");
  const paths = serverPaths(dataDir);
  const bins = tools();
  if (mustExist && !existsSync(join(paths.data, "mysql"))) {
    throw new BackupError(`There is no database server in ${dataDir} (has \`npm start\` run in this checkout?).`);
  }
  const answers = () =>
    spawnSync(bins.client, ["--no-defaults", `--socket=${paths.socket}`, "-uroot", "-e", "SELECT 1"], { stdio: "ignore" }).status === 0;
  if (livePid(paths.pidFile) && answers()) {
    return work({ bins, paths, sql: (sql) => rootSql(bins, paths, sql), startedHere: false });
  }
  if (target.port === null) throw new BackupError(`The server in ${dataDir} is not running; give --port so that it can be started.`);
  const server = await startMariadb({ dataDir, port: target.port, portVariable: target.portVariable });
  try {
    return await work({ bins, paths, sql: server.sql, startedHere: true });
  } finally {
    await server.stop();
  }
}

function sha256File(path) {
  return new Promise((resolveHash, reject) => {
    const hash = createHash("sha256");
    createReadStream(path)
      .on("data", (chunk) => hash.update(chunk))
      .on("error", reject)
      .on("end", () => resolveHash(hash.digest("hex")));
  });
}

function listFiles(root) {
  const out = [];
  if (!existsSync(root)) return out;
  const walk = (dir) => {
    for (const entry of readdirSync(dir, { withFileTypes: true })) {
      const full = join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (entry.isFile()) out.push(relative(root, full).split(sep).join("/"));
    }
  };
  walk(root);
  return out.sort();
}

/** The sha256 and size of every file under a folder, by its path relative to the folder. */
export async function fileHashes(root) {
  const out = [];
  for (const path of listFiles(root)) {
    const full = join(root, path);
    out.push({ path, bytes: statSync(full).size, sha256: await sha256File(full) });
  }
  return out;
}

function runTool(command, args, { stdout, stdin } = {}) {
  return new Promise((resolveRun, reject) => {
    const child = spawn(command, args, { stdio: [stdin ? "pipe" : "ignore", stdout ? "pipe" : "ignore", "pipe"] });
    let stderr = "";
    child.stderr.on("data", (chunk) => {
      stderr += chunk;
    });
    const done = new Promise((resolveExit) => child.on("close", (code, signal) => resolveExit(code ?? (signal ? 1 : 0))));
    const streams = [];
    if (stdout) streams.push(pipeline(child.stdout, stdout));
    if (stdin) streams.push(pipeline(stdin, child.stdin));
    Promise.all([done, ...streams]).then(
      ([code]) =>
        code === 0
          ? resolveRun()
          : reject(
              new BackupError(`${command.split("/").pop()} failed (exit ${code}): ${stderr.trim().split("\n").slice(-3).join(" | ")}`),
            ),
      (error) => done.then(() => reject(new BackupError(`${command.split("/").pop()} failed: ${stderr.trim() || error.message}`))),
    );
  });
}

const stamp = (date) =>
  date
    .toISOString()
    .replace(/[-:]/g, "")
    .replace(/\.\d+Z$/, "Z");

/**
 * Writes one archive of the database and the uploads and returns its path. The dump is one
 * consistent snapshot (InnoDB, --single-transaction) taken without blocking the app; the uploads
 * are copied after it, so every file the dump refers to is in the archive (uploads are written
 * before the row that names them, and never changed or deleted in place).
 */
export async function backup(target, { label = "" } = {}) {
  const { dump: dumpBin, tar } = tools();
  return withServer(target, async ({ paths, sql }) => {
    const exists = sql(`SELECT COUNT(*) FROM information_schema.schemata WHERE schema_name = '${target.database}'`).trim() === "1";
    if (!exists) throw new BackupError(`The server in ${join(target.dir, "mariadb")} has no database ${target.database}.`);
    const version = sql("SELECT VERSION()").trim();
    const staging = mkdtempSync(join(tmpdir(), "decant-backup-"));
    try {
      const dumpFile = join(staging, "database.sql");
      await runTool(
        dumpBin,
        [
          "--no-defaults",
          `--socket=${paths.socket}`,
          "-uroot",
          "--single-transaction",
          "--quick",
          "--routines",
          "--triggers",
          "--hex-blob",
          "--default-character-set=utf8mb4",
          "--skip-lock-tables",
          "--add-drop-table",
          target.database,
        ],
        { stdout: createWriteStream(dumpFile) },
      );
      const uploadsDir = join(staging, "uploads");
      mkdirSync(uploadsDir);
      if (existsSync(target.uploads)) cpSync(target.uploads, uploadsDir, { recursive: true });
      const manifest = {
        format: FORMAT,
        createdAt: new Date().toISOString(),
        profile: target.profileName,
        database: target.database,
        server: version,
        dump: { file: "database.sql", bytes: statSync(dumpFile).size, sha256: await sha256File(dumpFile) },
        uploads: await fileHashes(uploadsDir),
      };
      writeFileSync(join(staging, "manifest.json"), `${JSON.stringify(manifest, null, 2)}\n`);
      mkdirSync(target.out, { recursive: true });
      const name = `decant-${target.name}${label ? `-${label}` : ""}-${stamp(new Date())}.tar.gz`;
      const archive = join(target.out, name);
      const partial = `${archive}.partial`;
      await runTool(tar, ["-czf", partial, "-C", staging, "manifest.json", "database.sql", "uploads"]);
      renameSync(partial, archive);
      return { archive, manifest };
    } finally {
      rmSync(staging, { recursive: true, force: true });
    }
  });
}

/** Drops `DEFINER=…` clauses so triggers and routines belong to whoever restores them, on any server. */
function withoutDefiners() {
  let rest = "";
  const strip = (line) => line.replace(/\/\*!50017 DEFINER=`[^`]*`@`[^`]*`\s*\*\/\s*/g, "").replace(/\bDEFINER=`[^`]*`@`[^`]*`\s*/g, "");
  return new Transform({
    transform(chunk, _encoding, callback) {
      const text = rest + chunk.toString("utf8");
      const cut = text.lastIndexOf("\n");
      if (cut < 0) {
        rest = text;
        return callback();
      }
      rest = text.slice(cut + 1);
      callback(null, strip(text.slice(0, cut + 1)));
    },
    flush(callback) {
      callback(null, strip(rest));
    },
  });
}

/** Reads and checks an archive into a temporary folder; the caller removes it. */
export async function unpack(file) {
  const { tar } = tools();
  if (!existsSync(file)) throw new BackupError(`No such backup: ${file}`);
  const staging = mkdtempSync(join(tmpdir(), "decant-restore-"));
  try {
    await runTool(tar, ["-xzf", resolve(file), "-C", staging, "--no-same-owner"]);
    const manifestPath = join(staging, "manifest.json");
    if (!existsSync(manifestPath)) throw new BackupError(`${file} is not a Decant backup (no manifest.json).`);
    const manifest = JSON.parse(readFileSync(manifestPath, "utf8"));
    if (manifest.format !== FORMAT) throw new BackupError(`${file} has format "${manifest.format}"; this version reads ${FORMAT}.`);
    const dumpFile = join(staging, manifest.dump.file);
    if (!existsSync(dumpFile) || (await sha256File(dumpFile)) !== manifest.dump.sha256)
      throw new BackupError(`${file}: the database dump does not match its manifest (damaged archive).`);
    const files = await fileHashes(join(staging, "uploads"));
    if (JSON.stringify(files) !== JSON.stringify(manifest.uploads))
      throw new BackupError(`${file}: the uploaded files do not match the manifest (damaged archive).`);
    return { staging, manifest, dumpFile };
  } catch (error) {
    rmSync(staging, { recursive: true, force: true });
    throw error;
  }
}

/**
 * Restores an archive: the database is dropped and loaded afresh from the dump (triggers included)
 * and UPLOAD_DIR gets exactly the archived files. Refuses while anything else is connected to the
 * database (stop `npm start` first). Whatever it replaces is first saved as a `before-restore`
 * backup beside the others, so a restore can itself be undone.
 */
export async function restore(target, file, { log = () => {} } = {}) {
  const { client } = tools();
  const { staging, manifest, dumpFile } = await unpack(file);
  try {
    return await withServer(
      target,
      async ({ paths, sql }) => {
        const db = target.database;
        const busy = Number(sql(`SELECT COUNT(*) FROM information_schema.processlist WHERE db = '${db}' AND id <> CONNECTION_ID()`).trim());
        if (busy > 0)
          throw new BackupError(
            `${busy} connection${busy === 1 ? " is" : "s are"} using the database ${db}; stop \`npm start\` (or whatever uses it) first, then restore.`,
          );
        const exists = sql(`SELECT COUNT(*) FROM information_schema.schemata WHERE schema_name = '${db}'`).trim() === "1";
        let safety = null;
        if (exists && Number(sql(`SELECT COUNT(*) FROM information_schema.tables WHERE table_schema = '${db}'`).trim()) > 0) {
          safety = (await backup(target, { label: "before-restore" })).archive;
          log(`The state it replaces is saved in ${safety}`);
        }
        sql(`DROP DATABASE IF EXISTS \`${db}\`; CREATE DATABASE \`${db}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
        try {
          await runTool(
            client,
            ["--no-defaults", `--socket=${paths.socket}`, "-uroot", "--default-character-set=utf8mb4", "--binary-mode", db],
            {
              stdin: createReadStream(dumpFile).pipe(withoutDefiners()),
            },
          );
        } catch (error) {
          throw new BackupError(
            `${error.message}${safety ? `\nThe database ${db} is incomplete; the state before the restore is in ${safety}.` : ""}`,
          );
        }
        // Uploads: exactly the archived files, nothing left over from before.
        rmSync(target.uploads, { recursive: true, force: true });
        mkdirSync(target.uploads, { recursive: true });
        cpSync(join(staging, "uploads"), target.uploads, { recursive: true });
        const tables = sql(
          `SELECT table_name FROM information_schema.tables WHERE table_schema = '${db}' AND table_type = 'BASE TABLE' ORDER BY table_name`,
        )
          .split("\n")
          .filter(Boolean);
        const triggers = Number(sql(`SELECT COUNT(*) FROM information_schema.triggers WHERE trigger_schema = '${db}'`).trim());
        return { manifest, tables: tables.length, triggers, files: manifest.uploads.length, safety };
      },
      { mustExist: false },
    );
  } finally {
    rmSync(staging, { recursive: true, force: true });
  }
}

// `npm run backup` and `npm run restore` round-trip the demo data on a throwaway private server of
// this file's own: every table's row count, the ledger's checksum and row hash, the triggers and
// the uploaded files' hashes come back exactly, and what changed after the backup is gone again.
import { spawn } from "node:child_process";
import { createHash, randomBytes } from "node:crypto";
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, unlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { QueryTypes, type Sequelize } from "sequelize";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ensureAppUser, startMariadb } from "../../scripts/lib/mariadb.mjs";
import { migrator, seeder } from "../../src/db/umzug";
import { createSequelize } from "../../src/lib/server/db";
import { freePort } from "../support/ports";

/** Runs a script of scripts/ to completion; resolves with its exit code and output. */
function script(name: string, args: string[]): Promise<{ code: number; output: string }> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [join("scripts", name), ...args], { stdio: ["ignore", "pipe", "pipe"] });
    let output = "";
    child.stdout.on("data", (c) => (output += c));
    child.stderr.on("data", (c) => (output += c));
    child.on("close", (code) => resolve({ code: code ?? 1, output }));
  });
}

const dir = mkdtempSync(join(tmpdir(), "decant-backup-test-"));
const uploads = join(dir, "uploads");
const backups = join(dir, "backups");
const credentials = { database: "decant_backup", user: "decant", password: `backup-${randomBytes(6).toString("hex")}` };
let port = 0;
let server: Awaited<ReturnType<typeof startMariadb>> | null = null;
let sequelize: Sequelize | null = null;

const open = () => {
  sequelize = createSequelize({
    DATABASE_HOST: "127.0.0.1",
    DATABASE_PORT: port,
    DATABASE_NAME: credentials.database,
    DATABASE_USER: credentials.user,
    DATABASE_PASSWORD: credentials.password,
  });
  return sequelize;
};
const close = async () => {
  await sequelize?.close();
  sequelize = null;
};
const target = () => ["--dir", dir, "--port", String(port), "--database", credentials.database, "--out", backups];

interface Snapshot {
  counts: Record<string, number>;
  /** CHECKSUM TABLE of every table (the ledger's summary tables and the audit log included). */
  checksums: Record<string, string>;
  ledgerChecksum: string;
  ledgerHash: string;
  triggers: string[];
  files: Record<string, string>;
}

/** Row counts of every table, the ledger's CHECKSUM TABLE and an ordered hash of its rows, the triggers, the files. */
async function snapshot(db: Sequelize): Promise<Snapshot> {
  const tables = (
    await db.query<{ name: string }>(
      "SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE' ORDER BY table_name",
      { type: QueryTypes.SELECT },
    )
  ).map((t) => t.name);
  const counts: Record<string, number> = {};
  for (const table of tables) {
    const [row] = await db.query<{ n: number }>(`SELECT COUNT(*) AS n FROM \`${table}\``, { type: QueryTypes.SELECT });
    counts[table] = Number(row!.n);
  }
  const checksums: Record<string, string> = {};
  for (const row of await db.query<{ Table: string; Checksum: string | number }>(
    `CHECKSUM TABLE ${tables.map((t) => `\`${t}\``).join(", ")}`,
    { type: QueryTypes.SELECT },
  )) {
    checksums[row.Table.split(".").pop()!] = String(row.Checksum);
  }
  const hash = createHash("sha256");
  for (const row of await db.query<Record<string, unknown>>("SELECT * FROM ledger_entries ORDER BY id", { type: QueryTypes.SELECT }))
    hash.update(`${JSON.stringify(row)}\n`);
  const triggers = (
    await db.query<{ t: string }>(
      "SELECT CONCAT(event_object_table, ':', trigger_name, ':', action_timing, ' ', event_manipulation) AS t FROM information_schema.triggers WHERE trigger_schema = DATABASE() ORDER BY t",
      { type: QueryTypes.SELECT },
    )
  ).map((r) => r.t);
  const files: Record<string, string> = {};
  const walk = (d: string, prefix = "") => {
    for (const entry of readdirSync(d, { withFileTypes: true })) {
      if (entry.isDirectory()) walk(join(d, entry.name), `${prefix}${entry.name}/`);
      else
        files[`${prefix}${entry.name}`] = createHash("sha256")
          .update(readFileSync(join(d, entry.name)))
          .digest("hex");
    }
  };
  if (existsSync(uploads)) walk(uploads);
  return { counts, checksums, ledgerChecksum: checksums.ledger_entries!, ledgerHash: hash.digest("hex"), triggers, files };
}

beforeAll(async () => {
  port = await freePort();
  server = await startMariadb({ dataDir: join(dir, "mariadb"), port });
  ensureAppUser(server, credentials);
  const db = open();
  await migrator(db).up();
  await seeder(db).up();
  // A few uploaded certificates, as storage.ts keeps them (key = certificates/<year>/<hex>.<ext>).
  mkdirSync(join(uploads, "certificates", "2026"), { recursive: true });
  for (const ext of ["pdf", "png", "pdf"])
    writeFileSync(
      join(uploads, "certificates", "2026", `${randomBytes(16).toString("hex")}.${ext}`),
      randomBytes(20_000 + Math.floor(Math.random() * 5_000)),
    );
}, 180_000);

afterAll(async () => {
  await close().catch(() => undefined);
  await server?.stop();
  rmSync(dir, { recursive: true, force: true });
});

describe("npm run backup / npm run restore", () => {
  it("round-trips the demo data: every table's rows, the ledger checksum, the triggers and every uploaded file; rows lost: 0", async () => {
    const before = await snapshot(sequelize!);
    expect(before.counts.ledger_entries).toBeGreaterThan(100);
    expect(before.triggers).toEqual(
      expect.arrayContaining([
        "ledger_entries:ledger_entries_no_update:BEFORE UPDATE",
        "ledger_entries:ledger_entries_no_delete:BEFORE DELETE",
      ]),
    );
    expect(Object.keys(before.files)).toHaveLength(3);

    // Online backup: the server stays up and the app's connection stays open meanwhile.
    const made = await script("backup.mjs", target());
    expect(made.code, made.output).toBe(0);
    const archive = /Backup written: (\S+\.tar\.gz)/.exec(made.output)?.[1];
    expect(archive, made.output).toBeTruthy();
    expect(archive!.startsWith(backups)).toBe(true);
    expect(archive).toMatch(/decant-decant_backup-\d{8}T\d{6}Z\.tar\.gz$/);

    // Life goes on after the backup: a ledger entry, a new user, a changed file, a removed file and a new one.
    await sequelize!.query(
      "INSERT INTO ledger_entries (occurred_at, kind, reagent_id, volume_ml, source_kind, created_at) VALUES (NOW(3), 'draw', 'water', 5, 'manual', NOW(3))",
    );
    await sequelize!.query(
      "INSERT INTO users (email, name, role, created_at, updated_at) VALUES ('later@demo.test', 'Added later', 'technician', NOW(), NOW())",
    );
    const [first, second] = Object.keys(before.files);
    writeFileSync(join(uploads, first!), "changed after the backup");
    unlinkSync(join(uploads, second!));
    writeFileSync(join(uploads, "certificates", "2026", `${"0".repeat(32)}.pdf`), "%PDF-1.4 added after the backup");
    const changed = await snapshot(sequelize!);
    expect(changed.counts.ledger_entries).toBe(before.counts.ledger_entries! + 1);
    expect(changed.ledgerHash).not.toBe(before.ledgerHash);

    // A restore refuses while something is connected to the database, and changes nothing.
    const refused = await script("restore.mjs", [archive!, ...target()]);
    expect(refused.code).not.toBe(0);
    expect(refused.output).toMatch(/connections? (is|are) using the database decant_backup; stop `npm start`/);
    expect(await snapshot(sequelize!)).toEqual(changed);

    // With the app gone and the server stopped, restore starts the server itself, loads, and stops it again.
    await close();
    await server!.stop();
    server = null;
    const restored = await script("restore.mjs", [archive!, ...target()]);
    expect(restored.code, restored.output).toBe(0);
    expect(restored.output).toMatch(/Restored \d+ tables, \d+ triggers and 3 uploaded files/);
    const safety = /saved in (\S+before-restore\S+\.tar\.gz)/.exec(restored.output)?.[1];
    expect(safety && existsSync(safety), restored.output).toBe(true);

    server = await startMariadb({ dataDir: join(dir, "mariadb"), port });
    const after = await snapshot(open());
    expect(after).toEqual(before);
    const lost = Object.entries(before.counts).reduce((n, [table, count]) => n + Math.max(0, count - (after.counts[table] ?? 0)), 0);
    console.log(
      `backup/restore: ${Object.keys(after.counts).length} tables, ${Object.values(after.counts).reduce((a, b) => a + b, 0)} rows, ${after.counts.ledger_entries} ledger entries (checksum ${after.ledgerChecksum}), ${after.triggers.length} triggers, ${Object.keys(after.files).length} files; rows lost: ${lost}`,
    );
    expect(lost).toBe(0);

    // The ledger is still append-only after the restore, for the app's own user.
    await expect(sequelize!.query("UPDATE ledger_entries SET volume_ml = 0 WHERE id = 1")).rejects.toThrow(/append-only/);
    await expect(sequelize!.query("DELETE FROM ledger_entries WHERE id = 1")).rejects.toThrow(/append-only/);
    const [{ n }] = (await sequelize!.query<{ n: number }>("SELECT COUNT(*) AS n FROM ledger_entries", { type: QueryTypes.SELECT })) as [
      { n: number },
    ];
    expect(Number(n)).toBe(before.counts.ledger_entries);

    // The safety archive holds what the restore replaced: restoring it brings the later changes back.
    await close();
    const undo = await script("restore.mjs", [safety!, ...target()]);
    expect(undo.code, undo.output).toBe(0);
    const undone = await snapshot(open());
    expect(undone.counts).toEqual(changed.counts);
    expect(undone.ledgerHash).toBe(changed.ledgerHash);
    expect(undone.files).toEqual(changed.files);
  }, 240_000);

  it("refuses an archive that is not a Decant backup, changing nothing", async () => {
    const bogus = join(dir, "not-a-backup.tar.gz");
    writeFileSync(bogus, randomBytes(200));
    const before = await snapshot(sequelize!);
    const answer = await script("restore.mjs", [bogus, ...target()]);
    expect(answer.code).not.toBe(0);
    expect(answer.output).toMatch(/decant: tar failed|not a Decant backup/);
    expect(await snapshot(sequelize!)).toEqual(before);
  }, 60_000);
});

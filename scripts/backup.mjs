// `npm run backup [-- --profile dev|test] [--dir DIR --port N --database NAME --uploads DIR --out DIR]`:
// one consistent archive of a profile's database and uploaded files under .data/backups/.
// Works while `npm start` runs (the dump is a single transaction); starts and stops the private
// server itself when it is not running. Node built-ins only (plus mariadb-dump and tar).
import { BackupError, backup, parseTarget } from "./lib/backup.mjs";
import { fail, log } from "./lib/util.mjs";

try {
  const target = parseTarget(process.argv.slice(2));
  if (target.positional.length)
    throw new BackupError(`Unexpected argument "${target.positional[0]}"; see the options in scripts/backup.mjs.`);
  const { archive, manifest } = await backup(target);
  log(
    `Backed up the database ${manifest.database} (${(manifest.dump.bytes / 1024).toFixed(0)} KiB of SQL) and ${manifest.uploads.length} uploaded file${manifest.uploads.length === 1 ? "" : "s"}.`,
  );
  log(`Backup written: ${archive}`);
} catch (error) {
  fail(error instanceof BackupError ? error.message : (error?.stack ?? String(error)));
}

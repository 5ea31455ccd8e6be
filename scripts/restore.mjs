// `npm run restore FILE [-- --profile dev|test] [--dir DIR --port N --database NAME --uploads DIR --out DIR]`:
// brings back the database and the uploaded files of an archive written by `npm run backup`.
// Stop `npm start` first: the restore refuses while anything is connected to the database. What it
// replaces is saved as a `before-restore` archive beside the others. Node built-ins only.
import { BackupError, parseTarget, restore } from "./lib/backup.mjs";
import { fail, log } from "./lib/util.mjs";

try {
  const target = parseTarget(process.argv.slice(2));
  const [file, ...extra] = target.positional;
  if (!file || extra.length)
    throw new BackupError("usage: npm run restore -- FILE [--profile dev|test] (FILE is a .tar.gz written by npm run backup)");
  log(`Restoring ${file} into the database ${target.database}…`);
  const result = await restore(target, file, { log });
  log(
    `Restored ${result.tables} tables, ${result.triggers} triggers and ${result.files} uploaded file${result.files === 1 ? "" : "s"} from the backup of ${result.manifest.createdAt}.`,
  );
} catch (error) {
  fail(error instanceof BackupError ? error.message : (error?.stack ?? String(error)));
}

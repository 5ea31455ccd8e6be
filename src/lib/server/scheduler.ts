// Scheduled work of an app instance. Each job takes a database lock (job_locks), so several
// instances behind a proxy never send the same mail twice.
import { pruneSignInRecords } from "./auth/prune";
import { runExpiryDigest } from "./services/expiry-digest";
import { ensureWasteAlertSchedule } from "./services/waste";

let started = false;

/** Starts every schedule once per process; DECANT_NO_SCHEDULE=1 turns them off (tests drive the jobs themselves). */
export function startSchedules() {
  if (started || process.env.DECANT_NO_SCHEDULE === "1") return;
  started = true;
  ensureWasteAlertSchedule();
  const digest = () =>
    void runExpiryDigest().catch((error) => console.warn(`expiry digest failed: ${error instanceof Error ? error.message : error}`));
  setTimeout(digest, 90_000).unref();
  setInterval(digest, 30 * 60_000).unref();
  const prune = () =>
    void pruneSignInRecords().catch((error) =>
      console.warn(`sign-in records prune failed: ${error instanceof Error ? error.message : error}`),
    );
  setInterval(prune, 60 * 60_000).unref();
}

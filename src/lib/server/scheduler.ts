// Scheduled work of an app instance: every timer of the app is here. Each job takes a database
// lock (job_locks), so several instances behind a proxy never send the same mail twice.
import { pruneSignInRecords } from "./auth/prune";
import { runExpiryDigest } from "./services/expiry-digest";
import { runReorderMail } from "./services/planning/reorder-mail";
import { runWasteAlertCheck } from "./services/waste/alerts";

const MINUTE = 60_000;

let started = false;

/** Runs `job` once after `first_ms`, then every `every_ms`; a failure is logged and the next tick tries again. */
function repeat(name: string, first_ms: number, every_ms: number, job: () => Promise<unknown>) {
  const tick = () => void job().catch((error) => console.warn(`${name} failed: ${error instanceof Error ? error.message : error}`));
  // Timers never keep the process alive on their own.
  setTimeout(tick, first_ms).unref();
  setInterval(tick, every_ms).unref();
}

/** Starts every schedule once per process; DECANT_NO_SCHEDULE=1 turns them off (tests drive the jobs themselves). */
export function startSchedules() {
  if (started || process.env.DECANT_NO_SCHEDULE === "1") return;
  started = true;
  repeat("waste alert check", MINUTE, 15 * MINUTE, () => runWasteAlertCheck());
  repeat("expiry digest", 90_000, 30 * MINUTE, () => runExpiryDigest());
  // The weekly list of what to order: checked every 30 minutes, sent once on Monday from 06:00 UTC.
  repeat("reorder mail", 2 * MINUTE, 30 * MINUTE, () => runReorderMail());
  repeat("sign-in records prune", 60 * MINUTE, 60 * MINUTE, () => pruneSignInRecords());
}

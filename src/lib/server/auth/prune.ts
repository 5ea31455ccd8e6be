import { execute } from "../query";

/** How long failed and successful attempts are kept: My account lists them, the audit log keeps the rest. */
export const ATTEMPTS_KEPT_DAYS = 90;

/**
 * Removes what no longer counts: ended sessions, attempts older than any window or list, and rate
 * buckets unused for a day (a missing bucket is a full one). Plain idempotent deletes, so several
 * instances may run it at once.
 */
export async function pruneSignInRecords(now = new Date()): Promise<void> {
  await execute("DELETE FROM sessions WHERE expires_at < :now", { replacements: { now } });
  await execute("DELETE FROM sign_in_attempts WHERE created_at < :before", {
    replacements: { before: new Date(now.getTime() - ATTEMPTS_KEPT_DAYS * 86_400_000) },
  });
  await execute("DELETE FROM rate_limit_buckets WHERE updated_at < :before", {
    replacements: { before: new Date(now.getTime() - 86_400_000) },
  });
}

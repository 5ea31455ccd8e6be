// Per-user rate limits on the expensive routes (label and statement PDFs, imports, exports): a
// token bucket per person and kind of work, kept in MariaDB so every app instance draws from the
// same bucket. A burst beyond it is answered 429 with Retry-After at once, before any work is done.
import type { RateLimited } from "../schemas/sign-in-settings";
import { HttpError } from "./http";
import { execute, selectOne } from "./query";
import { getSignInSettings } from "./services/sign-in-settings";

const WHAT: Record<RateLimited, string> = {
  "label-pdf": "label PDFs",
  "statement-pdf": "statement PDFs",
  import: "imports",
  export: "exports",
};

/**
 * Takes one token from the user's bucket or throws 429 saying when the next one is there. The
 * refill and the take are single statements (the take is conditional), so concurrent requests
 * never spend more than the bucket holds.
 */
export async function takeToken(userId: number, kind: RateLimited, now = new Date()): Promise<void> {
  const { burst, perMinute } = (await getSignInSettings()).rateLimits[kind];
  const perSecond = perMinute / 60;
  const replacements = { userId, kind, burst, perSecond, now };
  await execute(
    `INSERT INTO rate_limit_buckets (user_id, bucket, tokens, updated_at) VALUES (:userId, :kind, :burst, :now)
     ON DUPLICATE KEY UPDATE
       tokens = LEAST(:burst, tokens + GREATEST(0, TIMESTAMPDIFF(MICROSECOND, updated_at, :now)) / 1000000 * :perSecond),
       updated_at = GREATEST(updated_at, :now)`,
    { replacements },
  );
  const taken = await execute(
    "UPDATE rate_limit_buckets SET tokens = tokens - 1 WHERE user_id = :userId AND bucket = :kind AND tokens >= 1",
    {
      replacements,
    },
  );
  if (taken.affectedRows === 1) return;
  const row = await selectOne<{ tokens: number }>("SELECT tokens FROM rate_limit_buckets WHERE user_id = :userId AND bucket = :kind", {
    replacements,
  });
  const wait = Math.max(1, Math.ceil((1 - Number(row?.tokens ?? 0)) / perSecond));
  throw new HttpError(
    429,
    `Too many ${WHAT[kind]} at once: you may make ${burst} in a row and then ${perMinute} a minute. Try again in ${wait} s.`,
    { retryAfter_s: wait },
    { "retry-after": String(wait) },
  );
}

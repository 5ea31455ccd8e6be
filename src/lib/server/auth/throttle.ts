// Sign-in throttling: counts failed attempts in MariaDB (shared by every app instance) for the
// pair (account, address), the account, the address and the signed device, and lets
// throttle-rules.ts decide. Refused attempts are not recorded: only checked passwords and codes count.
import { decide, type ThrottleCounts, type ThrottleDecision } from "../../auth/throttle-rules";
import type { ThrottleSettings } from "../../schemas/sign-in-settings";
import { execute, selectOne } from "../query";

export interface AttemptContext {
  email: string;
  ip: string;
  userAgent: string | null;
  /** Nonce of a valid device cookie for the account, or null. */
  device: string | null;
  now: Date;
}

const MINUTE = 60_000;
const ago = (now: Date, minutes: number) => new Date(now.getTime() - minutes * MINUTE);

/** The time of the n-th most recent failure matching `where` since `since`, or null when there are fewer than n. */
async function nthFailure(where: string, replacements: Record<string, unknown>, n: number): Promise<Date | null> {
  const row = await selectOne<{ created_at: Date | string }>(
    `SELECT created_at FROM sign_in_attempts WHERE succeeded = 0 AND ${where} AND created_at > :since ORDER BY created_at DESC LIMIT 1 OFFSET :offset`,
    { replacements: { ...replacements, offset: n - 1 } },
  );
  return row ? new Date(row.created_at) : null;
}

/** The counts for one attempt: a device's own, or the pair, the account and the address for anyone else. */
export async function countFailures(ctx: AttemptContext, limits: ThrottleSettings): Promise<ThrottleCounts> {
  const { email, ip, device, now } = ctx;
  if (device) {
    const since = await sinceLastSuccess("device = :device AND email = :email", { device, email }, ago(now, limits.deviceWindow_min));
    return {
      trusted: true,
      deviceNth: await nthFailure("device = :device AND email = :email", { device, email, since }, limits.deviceFailures),
      pairNth: null,
      accountFailures: 0,
      accountNewest: null,
      accountNth: null,
      addressNth: null,
    };
  }
  const pairSince = await sinceLastSuccess("email = :email AND ip = :ip", { email, ip }, ago(now, limits.pairWindow_min));
  const accountSince = ago(now, limits.accountWindow_min);
  const [pairNth, account, accountNth, addressNth] = await Promise.all([
    nthFailure("email = :email AND ip = :ip AND device IS NULL", { email, ip, since: pairSince }, limits.pairFailures),
    selectOne<{ n: number | string; newest: Date | string | null }>(
      "SELECT COUNT(*) AS n, MAX(created_at) AS newest FROM sign_in_attempts WHERE email = :email AND succeeded = 0 AND device IS NULL AND created_at > :since",
      { replacements: { email, since: accountSince } },
    ),
    nthFailure("email = :email AND device IS NULL", { email, since: accountSince }, limits.accountBlockFailures),
    nthFailure("ip = :ip AND device IS NULL", { ip, since: ago(now, limits.addressWindow_min) }, limits.addressFailures),
  ]);
  return {
    trusted: false,
    deviceNth: null,
    pairNth,
    accountFailures: Number(account?.n ?? 0),
    accountNewest: account?.newest ? new Date(account.newest) : null,
    accountNth,
    addressNth,
  };
}

/** A success resets the pair's and the device's count (not the account's or the address's: an attacker's failures stay counted). */
async function sinceLastSuccess(where: string, replacements: Record<string, unknown>, windowStart: Date): Promise<Date> {
  const row = await selectOne<{ at: Date | string | null }>(
    `SELECT MAX(created_at) AS at FROM sign_in_attempts WHERE succeeded = 1 AND ${where} AND created_at > :since`,
    { replacements: { ...replacements, since: windowStart } },
  );
  return row?.at && new Date(row.at) > windowStart ? new Date(row.at) : windowStart;
}

export async function checkThrottle(ctx: AttemptContext, limits: ThrottleSettings): Promise<ThrottleDecision> {
  return decide(await countFailures(ctx, limits), limits, ctx.now);
}

export async function recordAttempt(ctx: AttemptContext, outcome: { succeeded: boolean; step?: "password" | "code" }) {
  await execute(
    "INSERT INTO sign_in_attempts (email, ip, user_agent, device, step, succeeded, created_at) VALUES (:email, :ip, :userAgent, :device, :step, :succeeded, :now)",
    {
      replacements: {
        email: ctx.email,
        ip: ctx.ip,
        userAgent: ctx.userAgent?.slice(0, 255) ?? null,
        device: ctx.device,
        step: outcome.step ?? "password",
        succeeded: outcome.succeeded,
        now: ctx.now,
      },
    },
  );
}

/**
 * After a failure: when the account has reached its block, claims the lock's one mail. The
 * conditional UPDATE lets exactly one request (of any instance) win for each lock. Returns the
 * moment the block lifts when this call won, null otherwise.
 */
export async function claimLockNotice(ctx: AttemptContext, limits: ThrottleSettings): Promise<Date | null> {
  if (ctx.device) return null;
  const since = ago(ctx.now, limits.accountWindow_min);
  const nth = await nthFailure("email = :email AND device IS NULL", { email: ctx.email, since }, limits.accountBlockFailures);
  if (!nth) return null;
  const lockedUntil = new Date(nth.getTime() + limits.accountWindow_min * MINUTE);
  await execute(
    "INSERT INTO sign_in_locks (email, locked_until, notified_until) VALUES (:email, :until, NULL) ON DUPLICATE KEY UPDATE locked_until = GREATEST(locked_until, VALUES(locked_until))",
    { replacements: { email: ctx.email, until: lockedUntil } },
  );
  const claimed = await execute(
    "UPDATE sign_in_locks SET notified_until = :until WHERE email = :email AND (notified_until IS NULL OR notified_until <= :now)",
    { replacements: { email: ctx.email, until: lockedUntil, now: ctx.now } },
  );
  return claimed.affectedRows === 1 ? lockedUntil : null;
}

import { Op } from "sequelize";
import { SignInAttempt } from "../models/auth";

export const THROTTLE_WINDOW_MS = 15 * 60_000;
export const MAX_FAILURES = 5;

/**
 * Seconds until another attempt is allowed, or 0. Counts failures for the account and for the
 * address separately: 5 within 15 minutes for either blocks the next attempt. Kept in MariaDB so
 * it holds across restarts and app instances.
 */
export async function secondsUntilAllowed(email: string, ip: string, now = new Date()): Promise<number> {
  const since = new Date(now.getTime() - THROTTLE_WINDOW_MS);
  let waitMs = 0;
  for (const where of [{ email }, { ip }]) {
    const failures = await SignInAttempt.findAll({
      where: { ...where, succeeded: false, createdAt: { [Op.gt]: since } },
      order: [["createdAt", "DESC"]],
      limit: MAX_FAILURES,
      attributes: ["createdAt"],
    });
    if (failures.length >= MAX_FAILURES) {
      const oldestCounted = failures[failures.length - 1]!.createdAt;
      waitMs = Math.max(waitMs, oldestCounted.getTime() + THROTTLE_WINDOW_MS - now.getTime());
    }
  }
  return Math.ceil(waitMs / 1000);
}

export async function recordAttempt(email: string, ip: string, succeeded: boolean) {
  await SignInAttempt.create({ email, ip, succeeded });
}

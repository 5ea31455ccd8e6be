// Whether a sign-in attempt may be checked now, from what the database counted. Pure: no I/O.
import type { ThrottleSettings } from "../schemas/sign-in-settings";

/**
 * What was counted for one attempt. Each `…Nth` is the time of the n-th most recent failure in
 * its window, where n is that scope's limit (so the scope is full), or null when it has fewer.
 */
export interface ThrottleCounts {
  /** The browser carries a valid device cookie for this account: only its own failures count. */
  trusted: boolean;
  deviceNth: Date | null;
  /** This account from this address, since the pair's last success. */
  pairNth: Date | null;
  /** This account from browsers without its device cookie. */
  accountFailures: number;
  accountNewest: Date | null;
  accountNth: Date | null;
  /** This address, over every account. */
  addressNth: Date | null;
}

export type ThrottleReason = "device" | "pair" | "account-delay" | "account-block" | "address";

export type ThrottleDecision = { allowed: true } | { allowed: false; retryAfter_s: number; reason: ThrottleReason };

const MINUTE = 60_000;

/** The wait before an account's next attempt once it has `failures` in its window: 1 s, 2 s, 4 s … up to the maximum. */
export function accountDelay_s(failures: number, limits: Pick<ThrottleSettings, "accountDelayAfter" | "accountMaxDelay_s">): number {
  if (failures < limits.accountDelayAfter) return 0;
  const doublings = Math.min(failures - limits.accountDelayAfter, 30);
  return Math.min(limits.accountMaxDelay_s, 2 ** doublings);
}

export function decide(counts: ThrottleCounts, limits: ThrottleSettings, now: Date): ThrottleDecision {
  const waits: [ThrottleReason, number][] = [];
  const until = (reason: ThrottleReason, from: Date | null, ms: number) => {
    if (from) waits.push([reason, from.getTime() + ms - now.getTime()]);
  };
  if (counts.trusted) {
    until("device", counts.deviceNth, limits.deviceWindow_min * MINUTE);
  } else {
    until("pair", counts.pairNth, limits.pairWindow_min * MINUTE);
    until("address", counts.addressNth, limits.addressWindow_min * MINUTE);
    until("account-block", counts.accountNth, limits.accountWindow_min * MINUTE);
    const delay = accountDelay_s(counts.accountFailures, limits);
    if (delay > 0) until("account-delay", counts.accountNewest, delay * 1000);
  }
  const longest = waits.filter(([, ms]) => ms > 0).sort((a, b) => b[1] - a[1])[0];
  if (!longest) return { allowed: true };
  return { allowed: false, reason: longest[0], retryAfter_s: Math.max(1, Math.ceil(longest[1] / 1000)) };
}

/** "Try again in 40 seconds." / "in 14 minutes." / "at 10:42." — the wait a person reads. */
export function describeWait(retryAfter_s: number): string {
  if (retryAfter_s < 90) return `${retryAfter_s} second${retryAfter_s === 1 ? "" : "s"}`;
  const minutes = Math.ceil(retryAfter_s / 60);
  return `${minutes} minute${minutes === 1 ? "" : "s"}`;
}

import { describe, expect, it } from "vitest";
import { accountDelay_s, decide, describeWait, type ThrottleCounts } from "../../../src/lib/auth/throttle-rules";
import { DEFAULT_SIGN_IN_SETTINGS } from "../../../src/lib/schemas/sign-in-settings";

const limits = DEFAULT_SIGN_IN_SETTINGS.throttle;
const now = new Date("2026-12-04T10:00:00Z");
const ago = (s: number) => new Date(now.getTime() - s * 1000);
const none: ThrottleCounts = {
  trusted: false,
  deviceNth: null,
  pairNth: null,
  accountFailures: 0,
  accountNewest: null,
  accountNth: null,
  addressNth: null,
};

describe("the defaults", () => {
  // NIST SP 800-63B §5.2.2: no more than 100 consecutive failed attempts on a single account.
  it("block an account's new browsers after at most 100 failures, and a pair after 5 in 15 minutes", () => {
    expect(limits.accountBlockFailures).toBeLessThanOrEqual(100);
    expect(limits).toMatchObject({ pairFailures: 5, pairWindow_min: 15, accountWindow_min: 60, addressWindow_min: 15 });
    // 20 accounts × 5 counted failures from one address must not reach the address limit (the first test).
    expect(limits.addressFailures).toBeGreaterThan(20 * limits.pairFailures);
  });
});

describe("accountDelay_s: delays rather than lockout", () => {
  it.each([
    [0, 0],
    [9, 0],
    [10, 1],
    [11, 2],
    [12, 4],
    [14, 16],
    [15, 30], // 32 s capped at the 30 s maximum
    [99, 30],
  ])("%i failures in the hour → %i s before the next attempt", (failures, delay) => {
    expect(accountDelay_s(failures, limits)).toBe(delay);
  });
});

describe("decide", () => {
  it("allows an attempt with nothing counted", () => {
    expect(decide(none, limits, now)).toEqual({ allowed: true });
  });

  it("holds a full pair until its oldest counted failure leaves the window", () => {
    expect(decide({ ...none, pairNth: ago(60) }, limits, now)).toEqual({ allowed: false, reason: "pair", retryAfter_s: 14 * 60 });
    expect(decide({ ...none, pairNth: ago(15 * 60) }, limits, now)).toEqual({ allowed: true });
  });

  it("delays an account after the free failures, counted from its newest failure", () => {
    expect(decide({ ...none, accountFailures: 12, accountNewest: ago(1) }, limits, now)).toEqual({
      allowed: false,
      reason: "account-delay",
      retryAfter_s: 3,
    });
    expect(decide({ ...none, accountFailures: 12, accountNewest: ago(4) }, limits, now)).toEqual({ allowed: true });
  });

  it("answers the longest of several waits", () => {
    const counts = { ...none, pairNth: ago(600), accountFailures: 100, accountNewest: ago(1), accountNth: ago(1200), addressNth: ago(60) };
    expect(decide(counts, limits, now)).toEqual({ allowed: false, reason: "account-block", retryAfter_s: 2400 });
  });

  it("judges a browser with the account's device cookie on its own failures only", () => {
    const attacked = { ...none, pairNth: ago(1), accountFailures: 100, accountNewest: ago(1), accountNth: ago(1), addressNth: ago(1) };
    expect(decide({ ...attacked, trusted: true }, limits, now)).toEqual({ allowed: true });
    expect(decide({ ...attacked, trusted: true, deviceNth: ago(60) }, limits, now)).toEqual({
      allowed: false,
      reason: "device",
      retryAfter_s: 14 * 60,
    });
  });
});

describe("describeWait", () => {
  it.each([
    [1, "1 second"],
    [45, "45 seconds"],
    [89, "89 seconds"],
    [90, "2 minutes"],
    [14 * 60, "14 minutes"],
  ])("%i s → %s", (s, text) => expect(describeWait(s)).toBe(text));
});

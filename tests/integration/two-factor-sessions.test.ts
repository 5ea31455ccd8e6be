// Two-factor sign-in (RFC 6238 codes computed here from the key, as an authenticator app would)
// and sessions that end (idle and absolute limits on a fixed clock), at the service level on a
// database of this file's own.
import { decodeBase32IgnorePadding } from "@oslojs/encoding";
import { generateHOTP } from "@oslojs/otp";
import { beforeAll, describe, expect, it } from "vitest";
import { signIn, completeSecondFactor, type SignInResult } from "../../src/lib/server/auth/sign-in";
import { createSession, listSessions, validateSession } from "../../src/lib/server/auth/sessions";
import { confirmSetup, startSetup, totpStep } from "../../src/lib/server/auth/two-factor";
import { HttpError } from "../../src/lib/server/http";
import { User } from "../../src/lib/server/models/auth";
import { endSessions, finishTwoFactor } from "../../src/lib/server/services/account-security";
import { getSignInSettings, saveSignInSettings } from "../../src/lib/server/services/sign-in-settings";
import { DEFAULT_SIGN_IN_SETTINGS } from "../../src/lib/schemas/sign-in-settings";
import { actor, useServiceDatabase } from "../support/service-database";

const db = useServiceDatabase();
const RIGHT = "decant-demo";
const ctx = (now: Date, ip = "192.0.2.40") => ({ ip, userAgent: "test", cookie: () => undefined, now });
const codeAt = (secret: string, when: Date) => generateHOTP(decodeBase32IgnorePadding(secret.replace(/ /g, "")), BigInt(totpStep(when)), 6);

async function refused(work: Promise<unknown>): Promise<{ status: number; message: string }> {
  try {
    await work;
  } catch (error) {
    if (error instanceof HttpError) return { status: error.status, message: error.message };
    throw error;
  }
  throw new Error("expected a refusal");
}

let admin: ReturnType<typeof actor>;
beforeAll(async () => {
  const a = (await User.findOne({ where: { email: "admin@demo.test" } }))!;
  admin = actor(a.id, "admin");
});

describe("TOTP two-factor sign-in", () => {
  let secret: string;
  const email = "tech@demo.test";
  const t0 = new Date("2026-12-04T09:00:10Z");

  beforeAll(async () => {
    const user = (await User.findOne({ where: { email } }))!;
    const key = await startSetup({ id: user.id, email }, t0);
    secret = key.secret;
    expect(key.uri).toMatch(/^otpauth:\/\/totp\/Decant:tech%40demo\.test\?/);
    // A wrong first code does not turn it on; the right one does and brings ten recovery codes.
    expect((await refused(confirmSetup(user.id, "000000", t0))).status).toBe(400);
    const codes = await confirmSetup(user.id, codeAt(secret, t0), t0);
    expect(codes).toHaveLength(10);
    expect(new Set(codes).size).toBe(10);
    recovery = codes;
  });
  let recovery: string[];

  async function passwordStep(now: Date): Promise<SignInResult> {
    const result = await signIn({ email, password: RIGHT }, ctx(now));
    expect(result.stage).toBe("second-factor");
    expect(result.device, "no device cookie before the second step").toBeNull();
    // The half-finished session opens nothing: the session check reports the step, not a signed-in user.
    expect((await validateSession(result.session.id, now))!.session.stage).toBe("second-factor");
    return result;
  }

  const step = async (result: SignInResult, code: string, now: Date) =>
    completeSecondFactor(result.session, { ...result.user, name: "Tech", clientId: null }, code, ctx(now));

  it("refuses a wrong code and signs in with the right one", async () => {
    const now = new Date(t0.getTime() + 60_000);
    const pending = await passwordStep(now);
    const wrong = await refused(step(pending, "123456" === codeAt(secret, now) ? "654321" : "123456", now));
    expect(wrong).toEqual({ status: 401, message: "That code is not right." });
    const done = await step(pending, codeAt(secret, now), now);
    expect(done.stage).toBe("signed-in");
    expect(done.session.id).not.toBe(pending.session.id);
    expect(done.device?.name).toMatch(/^decant_device_/);
    expect(await validateSession(pending.session.id, now), "the half-finished session has ended").toBeNull();
    expect((await validateSession(done.session.id, now))!.session.stage).toBe("signed-in");
  });

  it("refuses a code replayed inside its window", async () => {
    const now = new Date(t0.getTime() + 120_000);
    const code = codeAt(secret, now);
    await step(await passwordStep(now), code, now);
    const again = await passwordStep(new Date(now.getTime() + 5_000));
    expect(await refused(step(again, code, new Date(now.getTime() + 5_000)))).toEqual({
      status: 401,
      message: "That code has just been used. Wait for the app to show the next one.",
    });
    // The next step's code is fine.
    const next = new Date(now.getTime() + 30_000);
    expect((await step(again, codeAt(secret, next), next)).stage).toBe("signed-in");
  });

  it("accepts a recovery code once and refuses it the second time", async () => {
    const now = new Date(t0.getTime() + 600_000);
    expect((await step(await passwordStep(now), recovery[0]!.replace(/-/g, ""), now)).stage).toBe("signed-in");
    expect(await refused(step(await passwordStep(now), recovery[0]!.replace(/-/g, ""), now))).toEqual({
      status: 401,
      message: "That recovery code has already been used. Each one works once.",
    });
  });

  it("ends the half-finished sign-in after five wrong codes", async () => {
    const now = new Date(t0.getTime() + 900_000);
    const pending = await passwordStep(now);
    for (let i = 0; i < 4; i++) expect((await refused(step(pending, "000000", now))).status).toBe(401);
    expect((await refused(step(pending, "000000", now))).message).toMatch(/Sign in with your password again/);
    expect(await validateSession(pending.session.id, now)).toBeNull();
  });
});

describe("two-factor required for a role", () => {
  it("a manager without it is led to the set-up, not into the app, and is signed in once it is done", async () => {
    await saveSignInSettings(
      { ...DEFAULT_SIGN_IN_SETTINGS, sessions: { ...DEFAULT_SIGN_IN_SETTINGS.sessions, twoFactorRoles: ["manager", "admin"] } },
      admin,
      null,
    );
    const now = new Date();
    // A session the manager opened before the rule counts as waiting for the set-up too.
    const manager = (await User.findOne({ where: { email: "manager@demo.test" } }))!;
    const earlier = await createSession(manager.id, { stage: "signed-in", sharedBench: false, ip: null, userAgent: null, now });
    expect((await validateSession(earlier.id, now))!.session.stage).toBe("two-factor-setup");

    const result = await signIn({ email: "manager@demo.test", password: RIGHT }, ctx(now));
    expect(result.stage).toBe("two-factor-setup");
    const found = (await validateSession(result.session.id, now))!;
    expect(found.session.stage).toBe("two-factor-setup");
    const key = await startSetup(found.user, now);
    const done = await finishTwoFactor({ user: found.user, pending: found.session }, codeAt(key.secret, now), ctx(now));
    expect(done.recoveryCodes).toHaveLength(10);
    expect(done.signedIn?.stage).toBe("signed-in");
    expect((await validateSession(done.signedIn!.session.id, now))!.session.stage).toBe("signed-in");
    // A safety officer is not asked.
    expect((await signIn({ email: "safety@demo.test", password: RIGHT }, ctx(now))).stage).toBe("signed-in");
    await saveSignInSettings(DEFAULT_SIGN_IN_SETTINGS, admin, null);
  });
});

describe("sessions that end", () => {
  let userId: number;
  beforeAll(async () => {
    userId = (await User.findOne({ where: { email: "client@demo.test" } }))!.id;
  });
  const start = new Date("2026-12-04T08:00:00Z");
  const later = (minutes: number) => new Date(start.getTime() + minutes * 60_000);
  const open = (sharedBench = false) =>
    createSession(userId, { stage: "signed-in", sharedBench, ip: "192.0.2.50", userAgent: "test", now: start });

  it("ends after 12 hours without use, and lives on while used", async () => {
    const idle = await open();
    expect(await validateSession(idle.id, later(12 * 60 - 1))).not.toBeNull();
    const used = await open();
    // Used every 11 hours, it outlives the idle limit many times over…
    for (let h = 11; h <= 11 * 60; h += 11) expect(await validateSession(used.id, later(h * 60)), `after ${h} h`).not.toBeNull();
    const untouched = await open();
    expect(await validateSession(untouched.id, later(12 * 60))).toBeNull();
    // …and a session whose check came in time is still there a minute before its new deadline.
    expect(await validateSession(idle.id, later(24 * 60 - 2))).not.toBeNull();
  });

  it("ends 30 days after sign-in however much it is used", async () => {
    const s = await open();
    for (let h = 10; h < 30 * 24; h += 10) expect(await validateSession(s.id, later(h * 60)), `after ${h} h`).not.toBeNull();
    expect(await validateSession(s.id, later(30 * 24 * 60 - 1))).not.toBeNull();
    expect(await validateSession(s.id, later(30 * 24 * 60))).toBeNull();
  });

  it("a shared-bench session ends after 15 minutes without use; the limits are settings", async () => {
    const bench = await open(true);
    expect(await validateSession(bench.id, later(14))).not.toBeNull();
    expect(await validateSession(bench.id, later(14 + 15))).toBeNull();
    const settings = await getSignInSettings();
    await saveSignInSettings({ ...settings, sessions: { ...settings.sessions, idle_min: 60 } }, admin, null);
    const short = await open();
    expect(await validateSession(short.id, later(61))).toBeNull();
    await saveSignInSettings(DEFAULT_SIGN_IN_SETTINGS, admin, null);
  });

  it("signing out everywhere ends every other session and keeps this one", async () => {
    const now = new Date();
    const mine = await createSession(userId, { stage: "signed-in", sharedBench: false, ip: "192.0.2.51", userAgent: "here", now });
    const others = await Promise.all(
      [1, 2, 3].map((i) => createSession(userId, { stage: "signed-in", sharedBench: false, ip: `192.0.2.6${i}`, userAgent: "there", now })),
    );
    const listed = await listSessions(userId, mine.id, now);
    expect(listed.filter((s) => s.current)).toHaveLength(1);
    expect(JSON.stringify(listed)).not.toContain(mine.id);
    const user = { id: userId, email: "client@demo.test", name: "Client", role: "client" as const, clientId: null };
    const { ended } = await endSessions(user, mine, "this", "192.0.2.51");
    expect(ended).toBeGreaterThanOrEqual(3);
    for (const other of others) expect(await validateSession(other.id, now)).toBeNull();
    expect(await validateSession(mine.id, now)).not.toBeNull();
    expect((await listSessions(userId, mine.id, now)).map((s) => s.current)).toEqual([true]);
  });
});

void db;

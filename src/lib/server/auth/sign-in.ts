// The sign-in steps: password (throttled, see throttle.ts), then a code when the account has
// two-factor on, or its set-up when the account's role must have it. Only a finished sign-in
// opens the app, is listed as a sign-in, and earns the browser its device cookie.
import { describeWait, type ThrottleDecision } from "../../auth/throttle-rules";
import type { SignInInput } from "../../schemas/auth";
import type { SignInSettings } from "../../schemas/sign-in-settings";
import { accountLockedMail } from "../account-mail";
import { recordAudit } from "../audit";
import { HttpError } from "../http";
import { publicOrigin, sendMail } from "../mail";
import { User } from "../models/auth";
import { facilityTimeZone, getSignInSettings } from "../services/sign-in-settings";
import { formatLabelInstant } from "../../format";
import { deviceCookieName, issueDeviceCookie, verifiedDevice } from "./device-cookie";
import { hashPassword, verifyPassword } from "./password";
import { countCodeFailure, createSession, endSessionById, type OpenSession, type SessionStage, type SessionUser } from "./sessions";
import { checkThrottle, claimLockNotice, recordAttempt, type AttemptContext } from "./throttle";
import { checkSecondFactor, withTwoFactor } from "./two-factor";

// Verifying against a real hash when the account is unknown keeps both answers equally slow.
const decoyHash = hashPassword("decant-decoy-password-never-used");

const BAD_CREDENTIALS = "The e-mail address or password is not right.";
/** Wrong codes one half-finished sign-in may have before the password must be given again. */
export const MAX_CODE_FAILURES = 5;

export interface SignInContext {
  ip: string;
  userAgent: string | null;
  /** The request's cookie of that name (the device cookies). */
  cookie: (name: string) => string | undefined;
  now?: Date;
}

export interface DeviceCookie {
  name: string;
  value: string;
}

export interface SignInResult {
  session: OpenSession;
  user: { id: number; email: string; role: SessionUser["role"] };
  stage: SessionStage;
  /** Set when the sign-in is finished: the browser's (new) device cookie for the account. */
  device: DeviceCookie | null;
}

function tooMany(decision: Extract<ThrottleDecision, { allowed: false }>): HttpError {
  const wait = decision.retryAfter_s;
  return new HttpError(
    429,
    `Too many attempts. Try again in ${describeWait(wait)}.`,
    { retryAfter_s: wait },
    { "retry-after": String(wait) },
  );
}

async function attemptFor(email: string, userId: number | null, ctx: SignInContext): Promise<AttemptContext> {
  const device = userId ? await verifiedDevice(userId, ctx.cookie(await deviceCookieName(userId))) : null;
  return { email, ip: ctx.ip, userAgent: ctx.userAgent, device, now: ctx.now ?? new Date() };
}

/** Checks the password and opens a fresh session (a new id on every sign-in) at the step that comes next. */
export async function signIn(input: SignInInput, ctx: SignInContext): Promise<SignInResult> {
  const settings = await getSignInSettings();
  const user = await User.findOne({ where: { email: input.email } });
  const attempt = await attemptFor(input.email, user?.id ?? null, ctx);
  const decision = await checkThrottle(attempt, settings.throttle);
  if (!decision.allowed) throw tooMany(decision);
  const valid =
    user?.passwordHash && user.active
      ? await verifyPassword(user.passwordHash, input.password)
      : (await verifyPassword(await decoyHash, input.password), false);
  if (!user || !valid) {
    await recordFailure(attempt, settings, user, "password");
    throw new HttpError(401, BAD_CREDENTIALS);
  }
  const hasTwoFactor = (await withTwoFactor([user.id])).has(user.id);
  const stage: SessionStage = hasTwoFactor
    ? "second-factor"
    : settings.sessions.twoFactorRoles.includes(user.role)
      ? "two-factor-setup"
      : "signed-in";
  const session = await createSession(user.id, {
    stage,
    sharedBench: input.sharedBench ?? false,
    ip: ctx.ip,
    userAgent: ctx.userAgent,
    now: attempt.now,
  });
  const device = stage === "signed-in" ? await finishSignIn(user.id, attempt) : null;
  return { session, user: { id: user.id, email: user.email, role: user.role }, stage, device };
}

/** The second step: an app code or a recovery code for a session waiting for one. */
export async function completeSecondFactor(
  pending: OpenSession,
  user: SessionUser,
  code: string,
  ctx: SignInContext,
): Promise<SignInResult> {
  if (pending.stage !== "second-factor") throw new HttpError(409, "This sign-in is not waiting for a code.");
  const settings = await getSignInSettings();
  const attempt = await attemptFor(user.email, user.id, ctx);
  const decision = await checkThrottle(attempt, settings.throttle);
  if (!decision.allowed) throw tooMany(decision);
  const check = await checkSecondFactor(user.id, code, attempt.now);
  if (check !== "accepted") {
    await recordFailure(attempt, settings, user, "code", check);
    if ((await countCodeFailure(pending.id)) >= MAX_CODE_FAILURES) {
      await endSessionById(pending.id);
      throw new HttpError(401, "Too many wrong codes. Sign in with your password again.", { restart: true });
    }
    const message =
      check === "replayed"
        ? "That code has just been used. Wait for the app to show the next one."
        : check === "recovery-used"
          ? "That recovery code has already been used. Each one works once."
          : "That code is not right.";
    throw new HttpError(401, message);
  }
  return upgrade(pending, user, attempt);
}

/** After the required set-up (or a code): the half-finished session ends and a signed-in one replaces it. */
export async function upgrade(pending: OpenSession, user: SessionUser, attempt: AttemptContext | SignInContext): Promise<SignInResult> {
  const ctx = "email" in attempt ? attempt : await attemptFor(user.email, user.id, attempt);
  await endSessionById(pending.id);
  const session = await createSession(user.id, {
    stage: "signed-in",
    sharedBench: pending.sharedBench,
    ip: ctx.ip,
    userAgent: ctx.userAgent,
    now: ctx.now,
  });
  const device = await finishSignIn(user.id, ctx);
  return { session, user: { id: user.id, email: user.email, role: user.role }, stage: "signed-in", device };
}

async function finishSignIn(userId: number, attempt: AttemptContext): Promise<DeviceCookie> {
  await recordAttempt(attempt, { succeeded: true });
  await User.update({ lastSignInAt: attempt.now }, { where: { id: userId } });
  await recordAudit({ actorId: userId, action: "sign-in", entity: "user", entityId: userId, ip: attempt.ip });
  const { name, value } = await issueDeviceCookie(userId);
  return { name, value };
}

async function recordFailure(
  attempt: AttemptContext,
  settings: SignInSettings,
  user: { id: number; name: string; email: string } | null,
  step: "password" | "code",
  reason?: string,
) {
  await recordAttempt(attempt, { succeeded: false, step });
  await recordAudit({
    actorId: user?.id ?? null,
    action: step === "password" ? "sign-in-failed" : "sign-in-code-failed",
    entity: "user",
    entityId: user?.id ?? null,
    ip: attempt.ip,
    after: { email: attempt.email, ...(reason ? { reason } : {}) },
  });
  if (!user) return;
  const lockedUntil = await claimLockNotice(attempt, settings.throttle);
  if (lockedUntil) await mailLock(user, lockedUntil, settings.throttle.accountBlockFailures, attempt.ip);
}

/** The lock's one mail to the owner and the administrators; sending is not allowed to fail the answer. */
async function mailLock(user: { id: number; name: string; email: string }, lockedUntil: Date, failures: number, ip: string) {
  await recordAudit({
    actorId: null,
    action: "sign-in-locked",
    entity: "user",
    entityId: user.id,
    ip,
    after: { until: lockedUntil.toISOString() },
  });
  try {
    const zone = await facilityTimeZone();
    const until = formatLabelInstant(lockedUntil, zone);
    const origin = publicOrigin();
    const admins = await User.findAll({ where: { role: "admin", active: true } });
    const mails = [
      accountLockedMail({
        to: user.email,
        name: user.name,
        accountEmail: user.email,
        forOwner: true,
        failures,
        until,
        link: `${origin}/sign-in`,
      }),
      ...admins
        .filter((a) => a.id !== user.id)
        .map((a) =>
          accountLockedMail({
            to: a.email,
            name: a.name,
            accountEmail: user.email,
            forOwner: false,
            failures,
            until,
            link: `${origin}/users`,
          }),
        ),
    ];
    for (const mail of mails) await sendMail(mail);
  } catch (error) {
    console.error(`decant: could not send the lock notice for ${user.email}: ${error instanceof Error ? error.message : error}`);
  }
}

export async function signOut(sessionId: string) {
  await endSessionById(sessionId);
}

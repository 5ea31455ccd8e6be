// A person's own sign-in security on My account (and in a sign-in that must set up two-factor):
// two-factor on and off, recovery codes, open sessions and recent sign-ins.
import type { AccountSecurityView, NewKey } from "../../auth/types";
import type { StartTwoFactorInput } from "../../schemas/account-security";
import { recordAudit } from "../audit";
import { verifyPassword } from "../auth/password";
import { upgrade, type SignInResult } from "../auth/sign-in";
import { endUserSessions, listSessions, recentSignIns, type OpenSession, type SessionUser } from "../auth/sessions";
import { checkThrottle, recordAttempt } from "../auth/throttle";
import { confirmSetup, replaceRecoveryCodes, startSetup, turnOffTwoFactor, twoFactorStatus } from "../auth/two-factor";
import { can } from "../../permissions";
import { HttpError } from "../http";
import { User } from "../models/auth";
import { getSignInSettings } from "./sign-in-settings";

export interface RequestContext {
  ip: string;
  userAgent: string | null;
  cookie: (name: string) => string | undefined;
}

/** Who may set up two-factor here: a signed-in person, or a sign-in waiting for the set-up its role requires. */
export interface SetupIdentity {
  user: SessionUser;
  /** The half-finished sign-in, which the set-up completes. */
  pending: OpenSession | null;
}

export function setupIdentity(locals: App.Locals): SetupIdentity {
  if (locals.user) {
    if (!can(locals.user.role, "update:own-account"))
      throw new HttpError(403, "Your role may not do this (needs update:own-account).", { missingPermission: "update:own-account" });
    return { user: locals.user, pending: null };
  }
  if (locals.signInStep?.session.stage === "two-factor-setup") return { user: locals.signInStep.user, pending: locals.signInStep.session };
  throw new HttpError(401, "Sign in first.");
}

/**
 * The password again, before a change to how the account signs in. Wrong answers count like
 * failed sign-ins (the same limits), so an open session cannot be used to guess the password.
 */
export async function confirmPassword(user: SessionUser, password: string | undefined, ctx: RequestContext): Promise<void> {
  if (!password)
    throw new HttpError(400, "password: Enter your password to confirm", { fields: { password: "Enter your password to confirm" } });
  const settings = await getSignInSettings();
  const attempt = { email: user.email, ip: ctx.ip, userAgent: ctx.userAgent, device: null, now: new Date() };
  const decision = await checkThrottle(attempt, settings.throttle);
  if (!decision.allowed)
    throw new HttpError(
      429,
      "Too many wrong passwords. Try again later.",
      { retryAfter_s: decision.retryAfter_s },
      { "retry-after": String(decision.retryAfter_s) },
    );
  const stored = await User.findByPk(user.id, { attributes: ["passwordHash"] });
  if (!stored?.passwordHash || !(await verifyPassword(stored.passwordHash, password))) {
    await recordAttempt(attempt, { succeeded: false });
    throw new HttpError(400, "password: This is not your password", { fields: { password: "This is not your password" } });
  }
}

export async function beginTwoFactor(identity: SetupIdentity, input: StartTwoFactorInput, ctx: RequestContext): Promise<NewKey> {
  // During a sign-in the password was given a moment ago; from My account it is asked again.
  if (!identity.pending) await confirmPassword(identity.user, input.password, ctx);
  return startSetup(identity.user);
}

export interface TwoFactorTurnedOn {
  recoveryCodes: string[];
  /** When the set-up finished a sign-in: the signed-in session that replaces the half-finished one. */
  signedIn: SignInResult | null;
}

export async function finishTwoFactor(identity: SetupIdentity, code: string, ctx: RequestContext): Promise<TwoFactorTurnedOn> {
  const recoveryCodes = await confirmSetup(identity.user.id, code);
  await recordAudit({ actorId: identity.user.id, action: "two-factor-on", entity: "user", entityId: identity.user.id, ip: ctx.ip });
  const signedIn = identity.pending ? await upgrade(identity.pending, identity.user, ctx) : null;
  return { recoveryCodes, signedIn };
}

export async function turnOff(user: SessionUser, password: string, ctx: RequestContext): Promise<{ required: boolean }> {
  await confirmPassword(user, password, ctx);
  await turnOffTwoFactor(user.id);
  await recordAudit({ actorId: user.id, action: "two-factor-off", entity: "user", entityId: user.id, ip: ctx.ip });
  // A role that must use it is led to set it up again on the next page: the way to move it to a new phone.
  return { required: (await getSignInSettings()).sessions.twoFactorRoles.includes(user.role) };
}

export async function newRecoveryCodes(user: SessionUser, password: string, ctx: RequestContext): Promise<string[]> {
  await confirmPassword(user, password, ctx);
  if (!(await twoFactorStatus(user.id)).enabled) throw new HttpError(409, "Turn on two-factor sign-in first.");
  const codes = await replaceRecoveryCodes(user.id);
  await recordAudit({ actorId: user.id, action: "recovery-codes-replaced", entity: "user", entityId: user.id, ip: ctx.ip });
  return codes;
}

export async function endSessions(user: SessionUser, current: OpenSession | null, keep: "this" | "none", ip: string) {
  const ended = await endUserSessions(user.id, keep === "this" ? (current?.id ?? null) : null);
  await recordAudit({ actorId: user.id, action: "signed-out-everywhere", entity: "user", entityId: user.id, ip, after: { keep, ended } });
  return { ended };
}

/** Everything the security part of My account shows. */
export async function accountSecurity(user: SessionUser, current: OpenSession | null): Promise<AccountSecurityView> {
  const [twoFactor, sessions, signIns, settings] = await Promise.all([
    twoFactorStatus(user.id),
    listSessions(user.id, current?.id ?? null),
    recentSignIns(user.email),
    getSignInSettings(),
  ]);
  return {
    twoFactor: {
      ...twoFactor,
      enabledAt: twoFactor.enabledAt?.toISOString() ?? null,
      required: settings.sessions.twoFactorRoles.includes(user.role),
    },
    sessions,
    signIns,
    limits: {
      idle_min: settings.sessions.idle_min,
      absolute_days: settings.sessions.absolute_days,
      sharedBenchIdle_min: settings.sessions.sharedBenchIdle_min,
    },
  };
}

import type { SignInInput } from "../../schemas/auth";
import { recordAudit } from "../audit";
import { HttpError } from "../http";
import { User } from "../models/auth";
import { lucia } from "./lucia";
import { hashPassword, verifyPassword } from "./password";
import { recordAttempt, secondsUntilAllowed } from "./throttle";

// Verifying against a real hash when the account is unknown keeps both answers equally slow.
const decoyHash = hashPassword("decant-decoy-password-never-used");

const BAD_CREDENTIALS = "The e-mail address or password is not right.";

/** Checks credentials and opens a fresh session (a new id on every sign-in). */
export async function signIn(input: SignInInput, context: { ip: string; userAgent: string | null }) {
  const wait = await secondsUntilAllowed(input.email, context.ip);
  if (wait > 0) {
    throw new HttpError(
      429,
      `Too many attempts. Try again in ${Math.ceil(wait / 60)} minute${wait > 60 ? "s" : ""}.`,
      { retryAfter_s: wait },
      { "retry-after": String(wait) },
    );
  }
  const user = await User.findOne({ where: { email: input.email } });
  const valid =
    user?.passwordHash && user.active
      ? await verifyPassword(user.passwordHash, input.password)
      : (await verifyPassword(await decoyHash, input.password), false);
  await recordAttempt(input.email, context.ip, valid);
  if (!user || !valid) {
    await recordAudit({
      actorId: user?.id ?? null,
      action: "sign-in-failed",
      entity: "user",
      entityId: user?.id ?? null,
      ip: context.ip,
      after: { email: input.email },
    });
    throw new HttpError(401, BAD_CREDENTIALS);
  }
  const session = await lucia.createSession(user.id, {});
  await user.update({ lastSignInAt: new Date() });
  await recordAudit({ actorId: user.id, action: "sign-in", entity: "user", entityId: user.id, ip: context.ip });
  return { session, user };
}

export async function signOut(sessionId: string) {
  await lucia.invalidateSession(sessionId);
}

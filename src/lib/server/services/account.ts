// A person's own account: change password, forgotten password, set a password from a link.
import type { ChangePasswordInput, SetPasswordInput } from "../../schemas/auth";
import { resetMail } from "../account-mail";
import { recordAudit } from "../audit";
import { lucia } from "../auth/lucia";
import { hashPassword, verifyPassword } from "../auth/password";
import { createSession } from "../auth/sessions";
import { consumeToken, findUsableToken, issueToken, tokensIssuedSince } from "../auth/tokens";
import { getSequelize } from "../db";
import { HttpError } from "../http";
import { sendMail } from "../mail";
import { User } from "../models/auth";
import { inTransaction } from "./sql";

/** At most this many reset mails per account per 15 minutes, so the form cannot flood an inbox. */
export const MAX_RESET_MAILS = 3;
const RESET_WINDOW_MS = 15 * 60_000;

export const FORGOT_PASSWORD_ANSWER =
  "If an account exists for that address, a link to set a new password is on its way. It works once, for 48 hours.";

export const LINK_NOT_USABLE = "This link has expired or has already been used. Ask for a new one.";

/**
 * Checks the current password, stores the new one and ends every session of the user (other
 * browsers included); returns a fresh session for the browser that asked.
 */
export async function changePassword(
  userId: number,
  input: ChangePasswordInput,
  ctx: { ip: string | null; userAgent?: string | null; sharedBench?: boolean },
) {
  const user = await User.findByPk(userId);
  if (!user || !user.active || !user.passwordHash) throw new HttpError(401, "Sign in first.");
  if (!(await verifyPassword(user.passwordHash, input.currentPassword))) {
    throw new HttpError(400, "currentPassword: This is not your current password", {
      fields: { currentPassword: "This is not your current password" },
    });
  }
  await user.update({ passwordHash: await hashPassword(input.newPassword) });
  await lucia.invalidateUserSessions(user.id);
  await recordAudit({ actorId: user.id, action: "password-changed", entity: "user", entityId: user.id, ip: ctx.ip });
  return createSession(user.id, {
    stage: "signed-in",
    sharedBench: ctx.sharedBench ?? false,
    ip: ctx.ip,
    userAgent: ctx.userAgent ?? null,
  });
}

/**
 * Mails a reset link when the address belongs to an active account. The caller answers the same
 * whatever happens here, so the form does not tell who has an account.
 */
export async function requestPasswordReset(email: string, ctx: { ip: string | null; origin: string; now?: Date }): Promise<void> {
  const now = ctx.now ?? new Date();
  const user = await User.findOne({ where: { email } });
  if (!user || !user.active) return;
  if ((await tokensIssuedSince(user.id, "reset", new Date(now.getTime() - RESET_WINDOW_MS))) >= MAX_RESET_MAILS) return;
  const { token } = await issueToken(user.id, "reset", null, { now });
  await recordAudit({ actorId: null, action: "password-reset-requested", entity: "user", entityId: user.id, ip: ctx.ip });
  try {
    await sendMail(resetMail({ to: user.email, name: user.name, link: `${ctx.origin}/set-password?token=${encodeURIComponent(token)}` }));
  } catch (error) {
    console.error(`decant: could not send the reset link to ${user.email}: ${error instanceof Error ? error.message : error}`);
  }
}

/** What the set-password page shows for a link, without using it up. */
export async function describeLink(token: string): Promise<{ purpose: "invitation" | "reset"; name: string; email: string } | null> {
  if (token.length < 20 || token.length > 200) return null;
  const record = await findUsableToken(token);
  if (!record) return null;
  const user = await User.findByPk(record.userId);
  if (!user || !user.active) return null;
  return { purpose: record.purpose, name: user.name, email: user.email };
}

/** Uses the link once: sets the password and ends every session the account had. */
export async function setPasswordWithToken(input: SetPasswordInput, ctx: { ip: string | null }): Promise<{ email: string }> {
  const passwordHash = await hashPassword(input.newPassword);
  const result = await inTransaction(getSequelize(), async (transaction) => {
    const record = await consumeToken(input.token, transaction);
    if (!record) return null;
    const user = await User.findByPk(record.userId, { transaction });
    if (!user || !user.active) return null;
    await user.update({ passwordHash }, { transaction });
    await recordAudit(
      {
        actorId: user.id,
        action: record.purpose === "invitation" ? "invitation-accepted" : "password-changed",
        entity: "user",
        entityId: user.id,
        ip: ctx.ip,
        after: { via: record.purpose },
      },
      transaction,
    );
    return user;
  });
  if (!result) throw new HttpError(400, `token: ${LINK_NOT_USABLE}`, { fields: { token: LINK_NOT_USABLE } });
  await lucia.invalidateUserSessions(result.id);
  return { email: result.email };
}

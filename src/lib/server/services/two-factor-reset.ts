// An administrator's last resort for a person who lost both the phone and the recovery codes.
import { recordAudit } from "../audit";
import { endUserSessions } from "../auth/sessions";
import { turnOffTwoFactor, twoFactorStatus } from "../auth/two-factor";
import type { SignedInUser } from "../guard";
import { HttpError } from "../http";
import { User } from "../models/auth";

/**
 * Turns off the person's two-factor sign-in and ends their sessions; their next sign-in asks for
 * a new set-up when their role requires it. Only an administrator may do this to an
 * administrator's account, and nobody to their own (My account asks for the password there).
 */
export async function resetTwoFactor(id: number, actor: SignedInUser, ip: string | null): Promise<{ wasOn: boolean }> {
  const user = await User.findByPk(id);
  if (!user) throw new HttpError(404, "No such person.");
  if (user.id === actor.id) throw new HttpError(409, "Change your own two-factor sign-in on My account.");
  if (user.role === "admin" && actor.role !== "admin")
    throw new HttpError(403, "Only an administrator may change an administrator's account.", { missingPermission: "manage:settings" });
  const wasOn = (await twoFactorStatus(user.id)).enabled;
  await turnOffTwoFactor(user.id);
  await endUserSessions(user.id, null);
  await recordAudit({
    actorId: actor.id,
    action: "two-factor-reset",
    entity: "user",
    entityId: user.id,
    ip,
    before: { enabled: wasOn },
    after: { enabled: false },
  });
  return { wasOn };
}

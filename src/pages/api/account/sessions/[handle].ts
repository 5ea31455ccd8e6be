import { sessionHandleParams } from "../../../../lib/schemas/account-security";
import { clearSessionCookie } from "../../../../lib/server/auth/cookies";
import { endSessionByHandle, sessionHandle } from "../../../../lib/server/auth/sessions";
import { recordAudit } from "../../../../lib/server/audit";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { HttpError, validate } from "../../../../lib/server/http";

/** Ends one of the signed-in person's sessions, by the handle My account lists it under. */
export const DELETE = endpoint(async ({ locals, params, cookies, url, request, clientAddress }) => {
  const user = requirePermission(locals, "read:own-account");
  const { handle } = validate(params, sessionHandleParams);
  if (!(await endSessionByHandle(user.id, handle))) throw new HttpError(404, "No such open session of yours.");
  await recordAudit({ actorId: user.id, action: "session-ended", entity: "user", entityId: user.id, ip: clientAddress });
  if (locals.session && sessionHandle(locals.session.id) === handle) clearSessionCookie(cookies, url, request);
  return new Response(null, { status: 204 });
});

import { endSessionsSchema } from "../../../../lib/schemas/account-security";
import { clearSessionCookie } from "../../../../lib/server/auth/cookies";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, readJson } from "../../../../lib/server/http";
import { accountSecurity, endSessions } from "../../../../lib/server/services/account-security";

/** The signed-in person's open sessions, recent sign-ins and two-factor state. */
export const GET = endpoint(async ({ locals }) => {
  const user = requirePermission(locals, "read:own-account");
  return json(await accountSecurity(user, locals.session));
});

/** Signs out everywhere: every other session (`keep: "this"`), or every one including this (`"none"`). */
export const DELETE = endpoint(async ({ locals, request, cookies, url, clientAddress }) => {
  const user = requirePermission(locals, "read:own-account");
  const { keep } = await readJson(request, endSessionsSchema);
  const result = await endSessions(user, locals.session, keep, clientAddress);
  if (keep === "none") clearSessionCookie(cookies, url, request);
  return json(result);
});

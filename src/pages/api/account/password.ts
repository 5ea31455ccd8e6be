import { changePasswordSchema } from "../../../lib/schemas/auth";
import { setSessionCookieFor } from "../../../lib/server/auth/cookies";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { readJson } from "../../../lib/server/http";
import { changePassword } from "../../../lib/server/services/account";

/** Changes the signed-in user's password; every other session of the account ends. */
export const POST = endpoint(async ({ locals, request, cookies, url, clientAddress }) => {
  const user = requirePermission(locals, "update:own-account");
  const input = await readJson(request, changePasswordSchema);
  const sharedBench = locals.session?.sharedBench ?? false;
  const session = await changePassword(user.id, input, { ip: clientAddress, userAgent: request.headers.get("user-agent"), sharedBench });
  setSessionCookieFor(cookies, session.id, url, request, { sharedBench });
  return new Response(null, { status: 204 });
});

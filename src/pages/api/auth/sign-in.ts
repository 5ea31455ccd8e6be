import { signInSchema } from "../../../lib/schemas/auth";
import { setSessionCookieFor } from "../../../lib/server/auth/cookies";
import { signIn, signOut } from "../../../lib/server/auth/sign-in";
import { endpoint } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";

/** Public. */
export const POST = endpoint(async ({ request, cookies, url, clientAddress, locals }) => {
  const input = await readJson(request, signInSchema);
  // A sign-in always starts a new session; any session this browser had ends.
  if (locals.session) await signOut(locals.session.id);
  const { session, user } = await signIn(input, { ip: clientAddress, userAgent: request.headers.get("user-agent") });
  setSessionCookieFor(cookies, session.id, url, request);
  return json({ user: { email: user.email, role: user.role } });
});

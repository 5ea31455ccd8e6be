import { clearSessionCookie } from "../../../lib/server/auth/cookies";
import { signOut } from "../../../lib/server/auth/sign-in";
import { endpoint } from "../../../lib/server/guard";

/** Public: signing out without a session is a no-op. */
export const POST = endpoint(async ({ locals, cookies, url, request }) => {
  if (locals.session) await signOut(locals.session.id);
  clearSessionCookie(cookies, url, request);
  return new Response(null, { status: 204 });
});

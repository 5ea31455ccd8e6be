import { clearSessionCookie } from "../../../lib/server/auth/cookies";
import { signOut } from "../../../lib/server/auth/sign-in";
import { endpoint } from "../../../lib/server/guard";

/** Public: signing out without a session is a no-op; a half-finished sign-in ends too. */
export const POST = endpoint(async ({ locals, cookies, url, request }) => {
  const current = locals.session ?? locals.signInStep?.session;
  if (current) await signOut(current.id);
  clearSessionCookie(cookies, url, request);
  return new Response(null, { status: 204 });
});

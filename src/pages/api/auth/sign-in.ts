import { STEP_PAGES } from "../../../lib/auth/steps";
import { signInSchema } from "../../../lib/schemas/auth";
import { setDeviceCookie, setSessionCookieFor } from "../../../lib/server/auth/cookies";
import { signIn, signOut } from "../../../lib/server/auth/sign-in";
import { endpoint } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";

/**
 * Public. 200 with the user and `next`: null when signed in, or the page of the step that follows
 * (a two-factor code, or its required set-up); 401 for wrong credentials; 429 with Retry-After.
 */
export const POST = endpoint(async ({ request, cookies, url, clientAddress, locals }) => {
  const input = await readJson(request, signInSchema);
  // A sign-in always starts a new session; any session (or half-finished sign-in) this browser had ends.
  const current = locals.session ?? locals.signInStep?.session;
  if (current) await signOut(current.id);
  const result = await signIn(input, {
    ip: clientAddress,
    userAgent: request.headers.get("user-agent"),
    cookie: (name) => cookies.get(name)?.value,
  });
  // The session cookie first: tools that keep only the first cookie of the answer keep the session.
  setSessionCookieFor(cookies, result.session.id, url, request, { sharedBench: result.session.sharedBench });
  if (result.device) setDeviceCookie(cookies, result.device, url, request);
  const next = result.stage === "signed-in" ? null : STEP_PAGES[result.stage];
  return json({ user: { email: result.user.email, role: result.user.role }, next });
});

import { secondFactorSchema } from "../../../../lib/schemas/account-security";
import { setDeviceCookie, setSessionCookieFor } from "../../../../lib/server/auth/cookies";
import { completeSecondFactor } from "../../../../lib/server/auth/sign-in";
import { endpoint } from "../../../../lib/server/guard";
import { HttpError, json, readJson } from "../../../../lib/server/http";

/**
 * Public: the second step of a sign-in, for a browser whose password step asked for a code. 200
 * signed in; 401 for a wrong, replayed or used code (or no sign-in waiting); 429 when throttled.
 */
export const POST = endpoint(async ({ request, cookies, url, clientAddress, locals }) => {
  const { code } = await readJson(request, secondFactorSchema);
  const step = locals.signInStep;
  if (!step || step.session.stage !== "second-factor") throw new HttpError(401, "Sign in with your password first.", { restart: true });
  const result = await completeSecondFactor(step.session, step.user, code, {
    ip: clientAddress,
    userAgent: request.headers.get("user-agent"),
    cookie: (name) => cookies.get(name)?.value,
  });
  setSessionCookieFor(cookies, result.session.id, url, request, { sharedBench: result.session.sharedBench });
  if (result.device) setDeviceCookie(cookies, result.device, url, request);
  return json({ user: { email: result.user.email, role: result.user.role }, next: null });
});

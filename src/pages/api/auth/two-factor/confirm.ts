import { confirmTwoFactorSchema } from "../../../../lib/schemas/account-security";
import { setDeviceCookie, setSessionCookieFor } from "../../../../lib/server/auth/cookies";
import { endpoint } from "../../../../lib/server/guard";
import { json, readJson } from "../../../../lib/server/http";
import { finishTwoFactor, setupIdentity } from "../../../../lib/server/services/account-security";

/** The first code from the new key: two-factor is on, and the ten recovery codes come back, once. */
export const POST = endpoint(async ({ request, cookies, url, clientAddress, locals }) => {
  const { code } = await readJson(request, confirmTwoFactorSchema);
  const identity = setupIdentity(locals);
  const { recoveryCodes, signedIn } = await finishTwoFactor(identity, code, {
    ip: clientAddress,
    userAgent: request.headers.get("user-agent"),
    cookie: (name) => cookies.get(name)?.value,
  });
  if (signedIn) {
    setSessionCookieFor(cookies, signedIn.session.id, url, request, { sharedBench: signedIn.session.sharedBench });
    if (signedIn.device) setDeviceCookie(cookies, signedIn.device, url, request);
  }
  return json({ recoveryCodes, signedIn: Boolean(signedIn) });
});

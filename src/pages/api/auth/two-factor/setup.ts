import { startTwoFactorSchema } from "../../../../lib/schemas/account-security";
import { endpoint } from "../../../../lib/server/guard";
import { json, readJson } from "../../../../lib/server/http";
import { beginTwoFactor, setupIdentity } from "../../../../lib/server/services/account-security";

/**
 * A new authenticator key and its QR code, for a signed-in person (password again) or a sign-in
 * whose role must set up two-factor. The key works once its first code is confirmed.
 */
export const POST = endpoint(async ({ request, cookies, clientAddress, locals }) => {
  const input = await readJson(request, startTwoFactorSchema);
  const identity = setupIdentity(locals);
  const key = await beginTwoFactor(identity, input, {
    ip: clientAddress,
    userAgent: request.headers.get("user-agent"),
    cookie: (name) => cookies.get(name)?.value,
  });
  return json(key);
});

import { passwordAgainSchema } from "../../../lib/schemas/account-security";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { newRecoveryCodes } from "../../../lib/server/services/account-security";

/** Ten new recovery codes (the password again); the earlier ones stop working. */
export const POST = endpoint(async ({ locals, request, cookies, clientAddress }) => {
  const user = requirePermission(locals, "update:own-account");
  const { password } = await readJson(request, passwordAgainSchema);
  const recoveryCodes = await newRecoveryCodes(user, password, {
    ip: clientAddress,
    userAgent: request.headers.get("user-agent"),
    cookie: (name) => cookies.get(name)?.value,
  });
  return json({ recoveryCodes });
});

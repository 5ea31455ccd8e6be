import { passwordAgainSchema } from "../../../lib/schemas/account-security";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { turnOff } from "../../../lib/server/services/account-security";

/** Turns two-factor sign-in off (the password again). A role that must use it is led to set it up anew. */
export const DELETE = endpoint(async ({ locals, request, cookies, clientAddress }) => {
  const user = requirePermission(locals, "update:own-account");
  const { password } = await readJson(request, passwordAgainSchema);
  const result = await turnOff(user, password, {
    ip: clientAddress,
    userAgent: request.headers.get("user-agent"),
    cookie: (name) => cookies.get(name)?.value,
  });
  return json(result);
});

import { endpoint, requirePermission } from "../../lib/server/guard";
import { json } from "../../lib/server/http";

export const GET = endpoint(({ locals }) => {
  const user = requirePermission(locals, "read:own-account");
  return json({ email: user.email, role: user.role, name: user.name });
});

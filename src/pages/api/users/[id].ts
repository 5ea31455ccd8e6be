import { updateUserSchema } from "../../../lib/schemas/auth";
import { idParam } from "../../../lib/schemas/fields";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson, validate } from "../../../lib/server/http";
import { publicOrigin } from "../../../lib/server/mail";
import { updateUser } from "../../../lib/server/services/users";

/** Changes a user's role (and organisation), or deactivates / reactivates the account. */
export const PATCH = endpoint(async ({ locals, params, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:user");
  const { id } = validate(params, idParam);
  const input = await readJson(request, updateUserSchema);
  return json({ user: await updateUser(id, input, { actor, ip: clientAddress, origin: publicOrigin() }) });
});

import { idParam } from "../../../../lib/schemas/fields";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, validate } from "../../../../lib/server/http";
import { publicOrigin } from "../../../../lib/server/mail";
import { resendLink } from "../../../../lib/server/services/users";

/** Mails the user a fresh one-time link: an invitation until a password is chosen, a reset link after. */
export const POST = endpoint(async ({ locals, params, clientAddress }) => {
  const actor = requirePermission(locals, "manage:user");
  const { id } = validate(params, idParam);
  return json(await resendLink(id, { actor, ip: clientAddress, origin: publicOrigin() }));
});

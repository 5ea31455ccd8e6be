import { idParam } from "../../../../lib/schemas/fields";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, validate } from "../../../../lib/server/http";
import { resetTwoFactor } from "../../../../lib/server/services/two-factor-reset";

/** Turns off a person's two-factor sign-in (lost phone and recovery codes) and ends their sessions. */
export const DELETE = endpoint(async ({ locals, params, clientAddress }) => {
  const actor = requirePermission(locals, "manage:user");
  const { id } = validate(params, idParam);
  return json(await resetTwoFactor(id, actor, clientAddress));
});

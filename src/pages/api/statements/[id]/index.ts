import { idParam } from "../../../../lib/schemas/billing";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, validate } from "../../../../lib/server/http";
import { getStatement } from "../../../../lib/server/services/billing/statements";

export const GET = endpoint(async ({ locals, params }) => {
  const user = requirePermission(locals, "read:statement", { own: true });
  return json(await getStatement(validate(params.id, idParam, "id"), user));
});

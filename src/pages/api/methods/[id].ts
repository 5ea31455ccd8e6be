import { methodSchema } from "../../../lib/schemas/methods";
import { idParam } from "../../../lib/schemas/fields";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { HttpError, json, readJson, validate } from "../../../lib/server/http";
import { getMethod, updateMethod } from "../../../lib/server/services/methods";

export const GET = endpoint(async ({ locals, params }) => {
  requirePermission(locals, "read:instrument");
  const { id } = validate(params, idParam);
  const method = await getMethod(id);
  if (!method) throw new HttpError(404, `id: no method ${id}`);
  return json(method);
});

export const PUT = endpoint(async ({ locals, request, params }) => {
  const user = requirePermission(locals, "manage:method");
  const { id } = validate(params, idParam);
  const input = await readJson(request, methodSchema);
  return json(await updateMethod(id, input, user));
});

import { idParam, statusSchema } from "../../../../../lib/schemas/waste";
import { endpoint, requirePermission } from "../../../../../lib/server/guard";
import { json, readJson, validate } from "../../../../../lib/server/http";
import { setContainerStatus } from "../../../../../lib/server/services/waste/containers";

export const POST = endpoint(async ({ locals, params, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:waste");
  const { id } = validate(params, idParam);
  const { status } = await readJson(request, statusSchema);
  return json({ container: await setContainerStatus(id, status, { actor, ip: clientAddress }) });
});

import { containerSchema, idParam } from "../../../../lib/schemas/waste";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, readJson, validate } from "../../../../lib/server/http";
import { getContainer, updateContainer } from "../../../../lib/server/services/waste/containers";
import { containerHistory } from "../../../../lib/server/services/waste/readings";

export const GET = endpoint(async ({ locals, params }) => {
  requirePermission(locals, "read:waste");
  const { id } = validate(params, idParam);
  return json({ container: await getContainer(id), history: await containerHistory(id) });
});

export const PUT = endpoint(async ({ locals, params, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:waste");
  const { id } = validate(params, idParam);
  const input = await readJson(request, containerSchema);
  return json({ container: await updateContainer(id, input, { actor, ip: clientAddress }) });
});

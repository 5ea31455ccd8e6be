import { streamIdParam, streamUpdateSchema } from "../../../../lib/schemas/waste";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, readJson, validate } from "../../../../lib/server/http";
import { updateStream } from "../../../../lib/server/services/waste/streams";

export const PUT = endpoint(async ({ locals, params, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:waste");
  const { id } = validate(params, streamIdParam);
  const input = await readJson(request, streamUpdateSchema);
  return json({ stream: await updateStream(id, input, { actor, ip: clientAddress }) });
});

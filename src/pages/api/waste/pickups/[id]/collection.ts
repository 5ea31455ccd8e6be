import { collectionSchema, idParam } from "../../../../../lib/schemas/waste";
import { endpoint, requirePermission } from "../../../../../lib/server/guard";
import { json, readJson, validate } from "../../../../../lib/server/http";
import { recordCollection } from "../../../../../lib/server/services/waste/pickups";

/** Records that the pickup was collected, with the manifest or reference number. */
export const POST = endpoint(async ({ locals, params, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:waste");
  const { id } = validate(params, idParam);
  const input = await readJson(request, collectionSchema);
  return json({ pickup: await recordCollection(id, input, { actor, ip: clientAddress }) });
});

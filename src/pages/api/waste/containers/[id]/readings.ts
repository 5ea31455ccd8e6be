import { idParam, readingSchema } from "../../../../../lib/schemas/waste";
import { endpoint, requirePermission } from "../../../../../lib/server/guard";
import { json, readJson, validate } from "../../../../../lib/server/http";
import { recordReading } from "../../../../../lib/server/services/waste/readings";

/** A manual level reading; the answer carries the difference from the estimate, which is kept. */
export const POST = endpoint(async ({ locals, params, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:waste");
  const { id } = validate(params, idParam);
  const input = await readJson(request, readingSchema);
  return json(await recordReading(id, input, { actor, ip: clientAddress }), 201);
});

import { bottleParams, bottleUpdateSchema } from "../../../../../lib/schemas/preparation";
import { endpoint, requirePermission } from "../../../../../lib/server/guard";
import { json, readJson, validate } from "../../../../../lib/server/http";
import { updateBottle } from "../../../../../lib/server/services/bottles";

/** Marks one bottle in use, empty or discarded. */
export const POST = endpoint(async ({ locals, params, request, clientAddress }) => {
  const user = requirePermission(locals, "update:batch");
  const { id, number } = validate(params, bottleParams);
  const change = await readJson(request, bottleUpdateSchema);
  return json({ batch: await updateBottle(id, number, change, user, clientAddress) });
});

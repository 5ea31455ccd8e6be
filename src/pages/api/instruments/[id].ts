import { instrumentSchema } from "../../../lib/schemas/instruments";
import { idParam } from "../../../lib/schemas/fields";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson, validate } from "../../../lib/server/http";
import { updateInstrument } from "../../../lib/server/services/instruments";

export const PUT = endpoint(async ({ locals, request, params }) => {
  const user = requirePermission(locals, "manage:instrument");
  const { id } = validate(params, idParam);
  const input = await readJson(request, instrumentSchema);
  return json(await updateInstrument(id, input, user));
});

import { idParam } from "../../../../lib/schemas/fields";
import { approveSchema } from "../../../../lib/schemas/preparation";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, readJson, validate } from "../../../../lib/server/http";
import { approveRecipe } from "../../../../lib/server/services/recipes";

export const POST = endpoint(async ({ locals, params, request, clientAddress }) => {
  const user = requirePermission(locals, "approve:recipe");
  const { id } = validate(params, idParam);
  const { version } = await readJson(request, approveSchema);
  return json({ recipe: await approveRecipe(id, version, user, clientAddress) });
});

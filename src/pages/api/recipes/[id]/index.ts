import { idParam } from "../../../../lib/schemas/fields";
import { recipeInputSchema } from "../../../../lib/schemas/recipes";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, readJson, validate } from "../../../../lib/server/http";
import { getRecipe, updateRecipe } from "../../../../lib/server/services/recipes";

export const GET = endpoint(async ({ locals, params }) => {
  requirePermission(locals, "read:recipe");
  return json({ recipe: await getRecipe(validate(params, idParam).id) });
});

/** Edits a recipe: in place while its latest version is unapproved and unused, else as a new version. */
export const PUT = endpoint(async ({ locals, params, request, clientAddress }) => {
  const user = requirePermission(locals, "create:recipe");
  const { id } = validate(params, idParam);
  const input = await readJson(request, recipeInputSchema);
  return json(await updateRecipe(id, input, user, clientAddress));
});

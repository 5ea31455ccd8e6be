import { recipeInputSchema, recipeListQuery } from "../../../lib/schemas/recipes";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, queryOf, readJson, validate } from "../../../lib/server/http";
import { createRecipe, listRecipes } from "../../../lib/server/services/recipes";

export const GET = endpoint(async ({ locals, url }) => {
  requirePermission(locals, "read:recipe");
  return json({ items: await listRecipes(validate(queryOf(url), recipeListQuery)) });
});

export const POST = endpoint(async ({ locals, request, clientAddress }) => {
  const user = requirePermission(locals, "create:recipe");
  const input = await readJson(request, recipeInputSchema);
  const recipe = await createRecipe(input, user, clientAddress);
  return json({ recipe }, 201, { location: `/recipes/${recipe.id}` });
});

import { variantSchema, variantsQuerySchema } from "../../../../lib/schemas/planning";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, queryOf, readJson, validate } from "../../../../lib/server/http";
import { createVariant, listVariants } from "../../../../lib/server/services/planning/variants";

export const GET = endpoint(async ({ locals, url }) => {
  requirePermission(locals, "read:planning");
  const { methodId } = validate(queryOf(url), variantsQuerySchema);
  return json({ items: await listVariants(methodId) });
});

/** Keeps a proposed variant with the program it was worked out from. */
export const POST = endpoint(async ({ locals, request }) => {
  const user = requirePermission(locals, "manage:planning");
  const input = await readJson(request, variantSchema);
  return json(await createVariant(input, user), 201);
});

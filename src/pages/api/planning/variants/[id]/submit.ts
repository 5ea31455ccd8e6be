import { submitVariantSchema } from "../../../../../lib/schemas/planning";
import { idParam } from "../../../../../lib/schemas/fields";
import { endpoint, requirePermission } from "../../../../../lib/server/guard";
import { json, readJson, validate } from "../../../../../lib/server/http";
import { submitVariant } from "../../../../../lib/server/services/planning/versions";

/** Makes the variant the method's next version, waiting for a manager's approval. */
export const POST = endpoint(async ({ locals, params, request }) => {
  const user = requirePermission(locals, "manage:planning");
  const { id } = validate(params, idParam);
  const { note } = await readJson(request, submitVariantSchema);
  return json(await submitVariant(id, note, user), 201);
});

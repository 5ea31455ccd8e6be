import { variantSchema } from "../../../lib/schemas/planning";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { previewVariant } from "../../../lib/server/services/planning/variants";

/** Works out a variant (program, warnings, greenness, saving over the ledger) without saving anything. */
export const POST = endpoint(async ({ locals, request }) => {
  requirePermission(locals, "read:planning");
  const input = await readJson(request, variantSchema);
  return json(await previewVariant(input));
});

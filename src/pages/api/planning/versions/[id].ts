import { versionDecisionSchema } from "../../../../lib/schemas/planning";
import { idParam } from "../../../../lib/schemas/fields";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, readJson, validate } from "../../../../lib/server/http";
import { decideVersion } from "../../../../lib/server/services/planning/versions";

/** Approves (the method takes the version's program) or rejects a pending method version. */
export const POST = endpoint(async ({ locals, params, request }) => {
  const user = requirePermission(locals, "approve:method");
  const { id } = validate(params, idParam);
  const { decision } = await readJson(request, versionDecisionSchema);
  return json(await decideVersion(id, decision, user));
});

import { idParam } from "../../../../lib/schemas/fields";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, validate } from "../../../../lib/server/http";
import { getBatch } from "../../../../lib/server/services/batches";

export const GET = endpoint(async ({ locals, params }) => {
  requirePermission(locals, "read:batch");
  return json({ batch: await getBatch(validate(params, idParam).id) });
});

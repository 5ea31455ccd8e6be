import { batchListQuery } from "../../../lib/schemas/batches";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, queryOf, validate } from "../../../lib/server/http";
import { listBatches } from "../../../lib/server/services/batches";

export const GET = endpoint(async ({ locals, url }) => {
  requirePermission(locals, "read:batch");
  const query = validate(queryOf(url), batchListQuery);
  return json({ items: await listBatches(query) });
});

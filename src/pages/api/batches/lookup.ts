import { batchLookupQuery } from "../../../lib/schemas/preparation";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, queryOf, validate } from "../../../lib/server/http";
import { findBatchByCode } from "../../../lib/server/services/batches";

/** `?code=B26-1203` (typed or scanned) → `{ id, href }`, or 404. */
export const GET = endpoint(async ({ locals, url }) => {
  requirePermission(locals, "read:batch");
  const { code } = validate(queryOf(url), batchLookupQuery);
  const id = await findBatchByCode(code);
  return json({ id, href: `/batches/${id}` });
});

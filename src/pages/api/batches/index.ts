import { batchListQuery } from "../../../lib/schemas/batches";
import { batchCreateSchema } from "../../../lib/schemas/preparation";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, queryOf, readJson, validate } from "../../../lib/server/http";
import { exportBatches, listBatches } from "../../../lib/server/services/batches";
import { recordBatch } from "../../../lib/server/services/preparation";

/** `{ items, nextCursor }`, newest first; `format=csv`: every batch the search and filters select. */
export const GET = endpoint(async ({ locals, url }) => {
  requirePermission(locals, "read:batch");
  const query = validate(queryOf(url), batchListQuery);
  if (query.format === "csv") return exportBatches(query);
  return json(await listBatches(query));
});

/** Records a batch; the same idempotency key again answers 200 with the batch already recorded. */
export const POST = endpoint(async ({ locals, request, clientAddress }) => {
  const user = requirePermission(locals, "create:batch");
  const input = await readJson(request, batchCreateSchema);
  const { created, batch } = await recordBatch(input, user, clientAddress);
  return json({ batch, created }, created ? 201 : 200, { location: `/batches/${batch.id}` });
});

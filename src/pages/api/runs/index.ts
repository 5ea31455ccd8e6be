import { runListQuery, runSchema } from "../../../lib/schemas/runs";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, queryOf, readJson, validate } from "../../../lib/server/http";
import { exportRuns, listRuns } from "../../../lib/server/services/run-views";
import { logRun } from "../../../lib/server/services/runs";

/** `{ items, nextCursor }`, newest first; `format=csv`: every run the search and filters select. */
export const GET = endpoint(async ({ locals, url }) => {
  requirePermission(locals, "read:run");
  const query = validate(queryOf(url), runListQuery);
  if (query.format === "csv") return exportRuns(query);
  return json(await listRuns(query));
});

/** 201 with the run; 200 with the same run when the idempotency key was seen before. */
export const POST = endpoint(async ({ locals, request, clientAddress }) => {
  const user = requirePermission(locals, "create:run");
  const input = await readJson(request, runSchema);
  const result = await logRun(input, user, clientAddress ?? null);
  return json(result, result.replayed ? 200 : 201);
});

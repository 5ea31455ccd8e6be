import { runListQuery, runSchema } from "../../../lib/schemas/runs";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, queryOf, readJson, validate } from "../../../lib/server/http";
import { listRuns } from "../../../lib/server/services/run-views";
import { logRun } from "../../../lib/server/services/runs";

export const GET = endpoint(async ({ locals, url }) => {
  requirePermission(locals, "read:run");
  const { limit } = validate(queryOf(url), runListQuery);
  return json({ items: await listRuns(limit) });
});

/** 201 with the run; 200 with the same run when the idempotency key was seen before. */
export const POST = endpoint(async ({ locals, request, clientAddress }) => {
  const user = requirePermission(locals, "create:run");
  const input = await readJson(request, runSchema);
  const result = await logRun(input, user, clientAddress ?? null);
  return json(result, result.replayed ? 200 : 201);
});

import { drawSchema } from "../../../lib/schemas/runs";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { logDraw } from "../../../lib/server/services/draws";

/** 201 with the draw; 200 with the same answer when the idempotency key was seen before. */
export const POST = endpoint(async ({ locals, request, clientAddress }) => {
  const user = requirePermission(locals, "create:draw");
  const input = await readJson(request, drawSchema);
  const result = await logDraw(input, user, clientAddress ?? null);
  return json(result, result.replayed ? 200 : 201);
});

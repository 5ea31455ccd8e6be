import { methodSchema } from "../../../lib/schemas/methods";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { createMethod, listMethods } from "../../../lib/server/services/methods";

export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "read:instrument");
  return json({ items: await listMethods() });
});

export const POST = endpoint(async ({ locals, request }) => {
  const user = requirePermission(locals, "manage:method");
  const input = await readJson(request, methodSchema);
  return json(await createMethod(input, user), 201);
});

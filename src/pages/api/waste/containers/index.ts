import { containerListQuery, containerSchema } from "../../../../lib/schemas/waste";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, queryOf, readJson, validate } from "../../../../lib/server/http";
import { createContainer, listContainers } from "../../../../lib/server/services/waste/containers";

export const GET = endpoint(async ({ locals, url }) => {
  requirePermission(locals, "read:waste");
  const { includeCollected } = validate(queryOf(url), containerListQuery);
  return json({ items: await listContainers({ includeCollected }) });
});

export const POST = endpoint(async ({ locals, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:waste");
  const input = await readJson(request, containerSchema);
  return json({ container: await createContainer(input, { actor, ip: clientAddress }) }, 201);
});

import { pickupRequestSchema } from "../../../../lib/schemas/waste";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, readJson } from "../../../../lib/server/http";
import { listPickups, requestPickup } from "../../../../lib/server/services/waste/pickups";

export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "read:waste");
  return json({ items: await listPickups() });
});

export const POST = endpoint(async ({ locals, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:waste");
  const input = await readJson(request, pickupRequestSchema);
  return json({ pickup: await requestPickup(input, { actor, ip: clientAddress }) }, 201);
});

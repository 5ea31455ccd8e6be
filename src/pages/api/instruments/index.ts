import { instrumentSchema } from "../../../lib/schemas/instruments";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { createInstrument, listInstruments } from "../../../lib/server/services/instruments";

export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "read:instrument");
  return json({ items: await listInstruments() });
});

export const POST = endpoint(async ({ locals, request }) => {
  const user = requirePermission(locals, "manage:instrument");
  const input = await readJson(request, instrumentSchema);
  return json(await createInstrument(input, user), 201);
});

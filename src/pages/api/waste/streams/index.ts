import { streamSchema } from "../../../../lib/schemas/waste";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, readJson } from "../../../../lib/server/http";
import { createStream, listStreams } from "../../../../lib/server/services/waste/streams";

export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "read:waste");
  return json({ items: await listStreams() });
});

export const POST = endpoint(async ({ locals, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:waste");
  const input = await readJson(request, streamSchema);
  return json({ stream: await createStream(input, { actor, ip: clientAddress }) }, 201);
});

import { routeCheckSchema } from "../../../lib/schemas/waste";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { HttpError, json, readJson } from "../../../lib/server/http";
import { checkContainerAccepts, wasteStreamForMix } from "../../../lib/server/services/waste";
import { WasteRuleError } from "../../../lib/waste/streams";

/** Where would this mix go, and does the container take it? The run form asks before a run is logged. */
export const POST = endpoint(async ({ locals, request }) => {
  requirePermission(locals, "read:waste");
  const input = await readJson(request, routeCheckSchema);
  let assignment;
  try {
    assignment = await wasteStreamForMix(input.parts);
  } catch (error) {
    if (error instanceof WasteRuleError) throw new HttpError(400, `parts: ${error.message}`);
    throw error;
  }
  const acceptance = await checkContainerAccepts(input.containerId, assignment.streamId);
  return json({ assignment, acceptance });
});

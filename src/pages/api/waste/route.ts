import { routeCheckSchema } from "../../../lib/schemas/waste";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { HttpError, json, readJson } from "../../../lib/server/http";
import { checkContainerAccepts, wasteStreamForMix } from "../../../lib/server/services/waste/route";
import { WasteRuleError } from "../../../lib/waste/streams";
import { hazardSummary } from "../../../lib/labels/hazards";

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
  // The mix's GHS pictograms and signal word (components at 1 % or more of the liquid volume, w/v for solids).
  const liquid = input.parts.reduce((sum, p) => sum + (p.volume_mL ?? 0), 0);
  const hazards = hazardSummary(
    input.parts.map((p) => ({ reagent: p.reagentId, share_percent: (((p.volume_mL ?? 0) + (p.mass_g ?? 0)) / liquid) * 100 })),
  );
  return json({
    assignment,
    acceptance,
    hazards: { pictograms: hazards.pictograms, signalWord: hazards.signalWord, statements: hazards.statements },
  });
});

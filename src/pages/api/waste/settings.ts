import { wasteSettingsSchema } from "../../../lib/schemas/waste";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { readWasteSettings, updateWasteSettings } from "../../../lib/server/services/waste/settings";

export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "manage:waste");
  return json({ settings: await readWasteSettings() });
});

export const PUT = endpoint(async ({ locals, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:waste");
  const input = await readJson(request, wasteSettingsSchema);
  return json({ settings: await updateWasteSettings(input, { actor, ip: clientAddress }) });
});

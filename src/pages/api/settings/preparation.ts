import { preparationSettingsSchema } from "../../../lib/schemas/preparation";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { getPreparationSettings, savePreparationSettings } from "../../../lib/server/services/preparation-settings";

export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "read:batch");
  return json({ settings: await getPreparationSettings() });
});

export const PUT = endpoint(async ({ locals, request, clientAddress }) => {
  const user = requirePermission(locals, "manage:preparation-settings");
  const settings = await readJson(request, preparationSettingsSchema);
  return json({ settings: await savePreparationSettings(settings, user, clientAddress) });
});

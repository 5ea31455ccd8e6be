import { facilitySettingsPatch } from "../../../lib/schemas/facility";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { getFacilitySettings, saveFacilitySettings } from "../../../lib/server/services/facility-settings";

/** Any signed-in user: the zone, locale and currency every screen uses. */
export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "read:own-account");
  return json(await getFacilitySettings());
});

/** Administrators: any of the three fields; a new zone rebuilds the per-day usage sums. */
export const PUT = endpoint(async ({ locals, request, clientAddress }) => {
  const user = requirePermission(locals, "manage:settings");
  const patch = await readJson(request, facilitySettingsPatch);
  return json(await saveFacilitySettings(patch, user, clientAddress));
});

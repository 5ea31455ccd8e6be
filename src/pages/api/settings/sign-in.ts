import { signInSettingsSchema } from "../../../lib/schemas/sign-in-settings";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { getSignInSettings, saveSignInSettings } from "../../../lib/server/services/sign-in-settings";

/** Sign-in limits, session lifetimes, required two-factor and rate limits: administrators only. */
export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "manage:settings");
  return json({ settings: await getSignInSettings() });
});

export const PUT = endpoint(async ({ locals, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:settings");
  const input = await readJson(request, signInSettingsSchema);
  return json({ settings: await saveSignInSettings(input, actor, clientAddress) });
});

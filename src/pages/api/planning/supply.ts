import { supplySettingSchema } from "../../../lib/schemas/planning";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { saveSupplySetting, supplyOverview } from "../../../lib/server/services/planning/supply";

export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "read:supply");
  return json({ items: await supplyOverview() });
});

/** One reagent's lead time and safety stock. */
export const PUT = endpoint(async ({ locals, request }) => {
  const user = requirePermission(locals, "manage:supply");
  const input = await readJson(request, supplySettingSchema);
  await saveSupplySetting(input, user);
  return json({ items: await supplyOverview() });
});

import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json } from "../../../lib/server/http";
import { facilityMethods } from "../../../lib/server/services/planning/facility";

/** Every method with its solvent over the last 12 months and its best saved variant. */
export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "read:planning");
  return json({ items: await facilityMethods() });
});

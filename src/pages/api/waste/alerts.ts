import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json } from "../../../lib/server/http";
import { currentAlerts, runWasteAlertCheck } from "../../../lib/server/services/waste/alerts";

/** The alerts as they stand now. */
export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "read:waste");
  return json({ items: await currentAlerts() });
});

/** Runs the scheduled check now: new alerts are recorded and mailed once to the safety officers. */
export const POST = endpoint(async ({ locals }) => {
  requirePermission(locals, "manage:waste");
  return json(await runWasteAlertCheck());
});

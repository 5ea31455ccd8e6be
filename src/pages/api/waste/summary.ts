import { wastePeriodQuery } from "../../../lib/schemas/waste";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, queryOf, validate } from "../../../lib/server/http";
import { wasteSummary } from "../../../lib/server/services/waste/totals";

/** The fixed contract: `{ streams: [{ stream, volume_mL }] }` for a period of ledger runs, draws and discards. */
export const GET = endpoint(async ({ locals, url }) => {
  requirePermission(locals, "read:waste");
  const period = validate(queryOf(url), wastePeriodQuery);
  return json(await wasteSummary(period));
});

import { usageQuery } from "../../../lib/schemas/usage";
import { endpoint, requirePermission, seesAllClients } from "../../../lib/server/guard";
import { json, queryOf, validate } from "../../../lib/server/http";
import { usageByProject } from "../../../lib/server/services/usage";

/** The fixed contract: `{ rows: [{ projectCode, volumes_mL, cost: { amount, currency } }] }`. */
export const GET = endpoint(async ({ locals, url }) => {
  const user = requirePermission(locals, "read:usage", { own: true });
  const query = validate(queryOf(url), usageQuery);
  if (seesAllClients(user, "read:usage")) return json(await usageByProject(query, { clientId: null }));
  // A client contact sees their own organisation's projects, and none without an organisation.
  if (user.clientId == null) return json({ from: query.from, to: query.to, groupBy: query.groupBy, rows: [] });
  return json(await usageByProject(query, { clientId: user.clientId }));
});

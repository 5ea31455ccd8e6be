import { usageQuery, type UsageQuery } from "../../../lib/schemas/usage";
import { endpoint, requirePermission, seesAllClients } from "../../../lib/server/guard";
import { json, queryOf, validate } from "../../../lib/server/http";
import { reagentNames, usageByProject } from "../../../lib/server/services/usage";
import { mobilePhasesByProject, usageGrouped } from "../../../lib/server/services/usage-groups";

/**
 * The fixed contract (groupBy=project): `{ rows: [{ projectCode, volumes_mL, cost: { amount, currency } }] }`.
 * groupBy=client|instrument|reagent|month answers `{ rows: [{ key, label, volumes_mL, mobilePhases_mL, cost, costs, … }] }`.
 * Both also carry `reagentNames` (id → name) for the screens.
 */
async function answer(query: UsageQuery, scope: { clientId: number | null }) {
  if (query.groupBy !== "project") return usageGrouped({ ...query, groupBy: query.groupBy }, scope);
  const usage = await usageByProject(query, scope);
  if (query.phases !== "1") return usage;
  const phases = await mobilePhasesByProject(query, scope);
  return {
    ...usage,
    mobilePhases: phases.mobilePhases,
    rows: usage.rows.map((r) => ({ ...r, mobilePhases_mL: phases.byProject.get(r.projectCode) ?? {} })),
  };
}

export const GET = endpoint(async ({ locals, url }) => {
  const user = requirePermission(locals, "read:usage", { own: true });
  const query = validate(queryOf(url), usageQuery);
  if (seesAllClients(user, "read:usage")) return json({ ...(await answer(query, { clientId: null })), reagentNames: await reagentNames() });
  // A client contact sees their own organisation's projects, and none without an organisation.
  if (user.clientId == null) return json({ from: query.from, to: query.to, groupBy: query.groupBy, rows: [] });
  return json({ ...(await answer(query, { clientId: user.clientId })), reagentNames: await reagentNames() });
});

import { rateInput } from "../../../lib/schemas/billing";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { addRate, listRates } from "../../../lib/server/services/billing/rates";

export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "manage:rate");
  return json({ items: await listRates() });
});

/** Adds a rate; existing rates are never changed (a later effective-from supersedes them). */
export const POST = endpoint(async ({ locals, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:rate");
  const input = await readJson(request, rateInput);
  return json({ rate: await addRate(input, actor, clientAddress) }, 201);
});

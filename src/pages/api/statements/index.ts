import { monthBounds } from "../../../lib/billing/statement";
import { monthQuery, statementOpenInput } from "../../../lib/schemas/billing";
import { endpoint, requirePermission, seesAllClients } from "../../../lib/server/guard";
import { json, queryOf, readJson, validate } from "../../../lib/server/http";
import { listStatements, openStatement, periodOverview } from "../../../lib/server/services/billing/statements";

/** Statements; with `?month=YYYY-MM` (staff), every client's state for that month. */
export const GET = endpoint(async ({ locals, url }) => {
  const user = requirePermission(locals, "read:statement", { own: true });
  const { month } = validate(queryOf(url), monthQuery);
  if (month && seesAllClients(user, "read:statement")) {
    const { periodStart, periodEnd } = monthBounds(month);
    return json({ periodStart, periodEnd, clients: await periodOverview(periodStart, periodEnd) });
  }
  return json({ items: await listStatements(user) });
});

/** Opens the draft for a client and period (or answers the existing statement). */
export const POST = endpoint(async ({ locals, request }) => {
  const actor = requirePermission(locals, "manage:statement");
  const input = await readJson(request, statementOpenInput);
  const result = await openStatement(input, actor);
  return json(result, result.created ? 201 : 200);
});

import { ledgerListQuery } from "../../../lib/schemas/ledger";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, queryOf, validate } from "../../../lib/server/http";
import { listEntries } from "../../../lib/server/services/ledger";

export const GET = endpoint(async ({ locals, url }) => {
  requirePermission(locals, "read:run");
  const query = validate(queryOf(url), ledgerListQuery);
  return json({ items: await listEntries(query) });
});

import { auditListQuery } from "../../../lib/schemas/audit";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, queryOf, validate } from "../../../lib/server/http";
import { exportAudit, listAudit } from "../../../lib/server/services/audit";

/** Managers and administrators: `{ items, nextCursor }`, newest first; `format=csv`: every line the filters select. */
export const GET = endpoint(async ({ locals, url }) => {
  requirePermission(locals, "read:audit");
  const query = validate(queryOf(url), auditListQuery);
  if (query.format === "csv") return exportAudit(query);
  return json(await listAudit(query));
});

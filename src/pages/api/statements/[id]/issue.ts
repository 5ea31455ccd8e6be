import { idParam, statementIssueInput } from "../../../../lib/schemas/billing";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, readJson, validate } from "../../../../lib/server/http";
import { issueStatement } from "../../../../lib/server/services/billing/statement-issue";
import { getStatement } from "../../../../lib/server/services/billing/statements";

/** Issues an internal client's chargeback statement; its period is then locked for that client. */
export const POST = endpoint(async ({ locals, params, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:statement");
  const id = validate(params.id, idParam, "id");
  const input = await readJson(request, statementIssueInput);
  await issueStatement(id, input, actor, clientAddress);
  return json(await getStatement(id, actor));
});

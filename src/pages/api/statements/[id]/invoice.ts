import { idParam, statementIssueInput } from "../../../../lib/schemas/billing";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, readJson, validate } from "../../../../lib/server/http";
import { invoiceStatement } from "../../../../lib/server/services/billing/statement-invoice";

/** Issues an external client's statement and sends its invoice; a repeat answers the same invoice. */
export const POST = endpoint(async ({ locals, params, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:invoice");
  const id = validate(params.id, idParam, "id");
  const input = await readJson(request, statementIssueInput);
  const { invoice, created } = await invoiceStatement(id, input, actor, clientAddress);
  return json({ invoice, created }, created ? 201 : 200);
});

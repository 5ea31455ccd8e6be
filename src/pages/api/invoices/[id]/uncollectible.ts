import { idParam } from "../../../../lib/schemas/billing";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { json, validate } from "../../../../lib/server/http";
import { markInvoiceUncollectible } from "../../../../lib/server/services/billing/invoices";

export const POST = endpoint(async ({ locals, params, clientAddress }) => {
  const actor = requirePermission(locals, "manage:invoice");
  return json({ invoice: await markInvoiceUncollectible(validate(params.id, idParam, "id"), actor, clientAddress) });
});

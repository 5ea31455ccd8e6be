import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json } from "../../../lib/server/http";
import { listInvoices } from "../../../lib/server/services/billing/invoices";

export const GET = endpoint(async ({ locals }) => {
  const user = requirePermission(locals, "read:invoice", { own: true });
  return json({ items: await listInvoices(user) });
});

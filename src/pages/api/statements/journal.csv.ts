import { journalQuery } from "../../../lib/schemas/billing";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { queryOf, validate } from "../../../lib/server/http";
import { takeToken } from "../../../lib/server/rate-limit";
import { chargebackJournal } from "../../../lib/server/services/billing/documents";

/** The chargeback journal (cost centre, project code, amount) of the issued internal statements in `from`–`to`. */
export const GET = endpoint(async ({ locals, url }) => {
  const user = requirePermission(locals, "manage:statement");
  await takeToken(user.id, "export");
  const { from, to } = validate(queryOf(url), journalQuery);
  const { text, fileName, statements } = await chargebackJournal(from, to);
  return new Response(text, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${fileName}"`,
      "cache-control": "private, no-store",
      "x-statement-count": String(statements),
    },
  });
});

import { idParam } from "../../../../lib/schemas/fields";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { validate } from "../../../../lib/server/http";
import { takeToken } from "../../../../lib/server/rate-limit";
import { statementCsvFile } from "../../../../lib/server/services/billing/documents";

export const GET = endpoint(async ({ locals, params }) => {
  const user = requirePermission(locals, "read:statement", { own: true });
  await takeToken(user.id, "export");
  const { text, fileName } = await statementCsvFile(validate(params, idParam).id, user);
  return new Response(text, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${fileName}"`,
      "cache-control": "private, no-store",
    },
  });
});

import { idParam } from "../../../../lib/schemas/fields";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { validate } from "../../../../lib/server/http";
import { takeToken } from "../../../../lib/server/rate-limit";
import { statementPdf } from "../../../../lib/server/services/billing/documents";

export const GET = endpoint(async ({ locals, params, url }) => {
  const user = requirePermission(locals, "read:statement", { own: true });
  await takeToken(user.id, "statement-pdf");
  const { bytes, fileName } = await statementPdf(validate(params, idParam).id, user);
  const disposition = url.searchParams.get("download") === "1" ? "attachment" : "inline";
  return new Response(new Uint8Array(bytes), {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `${disposition}; filename="${fileName}"`,
      "cache-control": "private, no-store",
    },
  });
});

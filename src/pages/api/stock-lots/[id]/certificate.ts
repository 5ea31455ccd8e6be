import { idParam } from "../../../../lib/schemas/preparation";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { validate } from "../../../../lib/server/http";
import { getCertificate } from "../../../../lib/server/services/stock-lots";

/** The certificate of analysis, to signed-in users who may read stock lots; never from public/. */
export const GET = endpoint(async ({ locals, params }) => {
  requirePermission(locals, "read:stock-lot");
  const { bytes, mime, name } = await getCertificate(validate(params.id, idParam));
  const safeName = name.replace(/[^\w.\- ]+/g, "_");
  return new Response(new Uint8Array(bytes), {
    headers: {
      "content-type": mime,
      "content-disposition": `inline; filename="${safeName}"`,
      "x-content-type-options": "nosniff",
      "content-security-policy": "default-src 'none'; img-src 'self'; style-src 'unsafe-inline'; sandbox",
      "cache-control": "private, no-store",
    },
  });
});

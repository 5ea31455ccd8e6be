import { idParam } from "../../../../lib/schemas/fields";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { validate } from "../../../../lib/server/http";
import { getCertificate } from "../../../../lib/server/services/stock-lots";
import { detectType } from "../../../../lib/server/storage";

/**
 * The certificate of analysis, to signed-in users who may read stock lots; never from public/.
 * Always a download (`attachment`), typed by what its bytes are rather than what the uploader
 * called it, so an uploaded file never renders as a page of Decant's origin.
 */
export const GET = endpoint(async ({ locals, params }) => {
  requirePermission(locals, "read:stock-lot");
  const { bytes, name } = await getCertificate(validate(params, idParam).id);
  const sniffed = detectType(bytes);
  const safeName = name.replace(/[^\w.\- ]+/g, "_");
  return new Response(new Uint8Array(bytes), {
    headers: {
      "content-type": sniffed?.mime ?? "application/octet-stream",
      "content-disposition": `attachment; filename="${safeName}"`,
      "x-content-type-options": "nosniff",
      "content-security-policy": "default-src 'none'; sandbox; frame-ancestors 'none'",
      "cache-control": "private, no-store",
    },
  });
});

import { labelQuery } from "../../../../lib/schemas/labels";
import { idParam } from "../../../../lib/schemas/fields";
import { endpoint, requirePermission } from "../../../../lib/server/guard";
import { queryOf, validate } from "../../../../lib/server/http";
import { takeToken } from "../../../../lib/server/rate-limit";
import { batchLabels } from "../../../../lib/server/services/labels";

/** Fixed contract: `application/pdf` with `copies` labels (default: one per bottle). */
export const GET = endpoint(async ({ locals, params, url }) => {
  const user = requirePermission(locals, "read:batch");
  await takeToken(user.id, "label-pdf");
  const { id } = validate(params, idParam);
  const query = validate(queryOf(url), labelQuery);
  const { bytes, fileName, labels } = await batchLabels(id, query);
  return new Response(new Uint8Array(bytes), {
    status: 200,
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `${query.disposition}; filename="${fileName}"`,
      "cache-control": "private, no-store",
      "x-label-count": String(labels),
    },
  });
});

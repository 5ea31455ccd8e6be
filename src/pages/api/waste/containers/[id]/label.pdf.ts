import { idParam } from "../../../../../lib/schemas/fields";
import { labelQuery } from "../../../../../lib/schemas/waste";
import { endpoint, requirePermission } from "../../../../../lib/server/guard";
import { queryOf, validate } from "../../../../../lib/server/http";
import { takeToken } from "../../../../../lib/server/rate-limit";
import { containerLabelContent } from "../../../../../lib/server/services/waste/documents";
import { renderContainerLabel } from "../../../../../lib/waste/container-label";

/** The container label (100 × 100 mm): Code 128 of the code, stream, GHS pictograms, accumulation start. */
export const GET = endpoint(async ({ locals, params, url }) => {
  const user = requirePermission(locals, "read:waste");
  await takeToken(user.id, "label-pdf");
  const { id } = validate(params, idParam);
  const { copies } = validate(queryOf(url), labelQuery);
  const content = await containerLabelContent(id);
  const bytes = await renderContainerLabel(content, copies);
  return new Response(new Uint8Array(bytes), {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `inline; filename="container-${content.code}.pdf"`,
      "cache-control": "no-store",
    },
  });
});

import { stockLotInputSchema, stockLotListQuery } from "../../../lib/schemas/stock-lots";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { HttpError, json, queryOf, readBodyBytes, validate } from "../../../lib/server/http";
import { CERTIFICATE_MAX_BYTES } from "../../../lib/server/storage";
import { createStockLot, exportStockLots, listStockLots } from "../../../lib/server/services/stock-lots";

/** `{ items, nextCursor }`, soonest expiry first; `format=csv`: every lot the search and filters select. */
export const GET = endpoint(async ({ locals, url }) => {
  requirePermission(locals, "read:stock-lot");
  const query = validate(queryOf(url), stockLotListQuery);
  if (query.format === "csv") return exportStockLots(query);
  return json(await listStockLots(query));
});

/** multipart/form-data: the lot's fields and an optional `certificate` file (PDF or image). */
export const POST = endpoint(async ({ locals, request, clientAddress }) => {
  const user = requirePermission(locals, "create:stock-lot");
  if (!(request.headers.get("content-type") ?? "").toLowerCase().startsWith("multipart/form-data")) {
    throw new HttpError(415, "body: send the lot as multipart/form-data");
  }
  // Read with a cap (by Content-Length, or while a chunked upload streams in), then parse the form.
  const raw = await readBodyBytes(
    request,
    CERTIFICATE_MAX_BYTES + 64 * 1024,
    `certificate: the upload is over the ${CERTIFICATE_MAX_BYTES / 1048576} MB limit`,
  );
  let form: FormData;
  try {
    form = await new Response(raw, { headers: { "content-type": request.headers.get("content-type")! } }).formData();
  } catch {
    throw new HttpError(400, "body: not a readable multipart form");
  }
  const fields: Record<string, string> = {};
  let file: File | null = null;
  for (const [key, value] of form.entries()) {
    if (key === "certificate") {
      // A form without a chosen file sends an empty, unnamed part; an empty file that has a name was chosen, and is refused.
      if (typeof value !== "string" && (value.size > 0 || value.name !== "")) file = value;
    } else if (typeof value === "string") fields[key] = value;
  }
  const input = validate(fields, stockLotInputSchema);
  const certificate = file ? { bytes: new Uint8Array(await file.arrayBuffer()), name: file.name } : null;
  const lot = await createStockLot(input, certificate, user, clientAddress);
  return json({ lot }, 201);
});

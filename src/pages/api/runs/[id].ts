import { idParam } from "../../../lib/schemas/fields";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { HttpError, json, validate } from "../../../lib/server/http";
import { listEntries } from "../../../lib/server/services/ledger";
import { getRun } from "../../../lib/server/services/run-views";

export const GET = endpoint(async ({ locals, params }) => {
  requirePermission(locals, "read:run");
  const { id } = validate(params, idParam);
  const run = await getRun(id);
  if (!run) throw new HttpError(404, `id: no run ${id}`);
  return json({ run, entries: await listEntries({ runId: id, limit: 1000 }) });
});

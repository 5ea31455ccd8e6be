import { runLogTemplate } from "../../../lib/imports/run-log";
import { endpoint, requirePermission } from "../../../lib/server/guard";

export const GET = endpoint(({ locals }) => {
  requirePermission(locals, "create:import");
  return new Response(runLogTemplate(), {
    headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": 'attachment; filename="decant-run-log-template.csv"' },
  });
});

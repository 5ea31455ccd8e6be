import { RUN_LOG_MAX_BYTES } from "../../../lib/imports/run-log";
import { importQuery } from "../../../lib/schemas/imports";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { HttpError, json, queryOf, validate } from "../../../lib/server/http";
import { checkRunLog, commitRunLog, listImports } from "../../../lib/server/services/imports";

export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "create:import");
  return json({ items: await listImports() });
});

const TOO_BIG = `file: larger than ${RUN_LOG_MAX_BYTES / 1024 / 1024} MB; split it into smaller files`;

export const POST = endpoint(async ({ locals, request, url, clientAddress }) => {
  const user = requirePermission(locals, "create:import");
  const { mode, fileName } = validate(queryOf(url), importQuery);
  const type = (request.headers.get("content-type") ?? "").toLowerCase();
  if (!/^(text\/(csv|plain)|application\/(vnd\.ms-excel|octet-stream))/.test(type)) throw new HttpError(415, "file: send the CSV file itself with content-type text/csv");
  if (Number(request.headers.get("content-length") ?? 0) > RUN_LOG_MAX_BYTES) throw new HttpError(413, TOO_BIG);
  const content = await request.text();
  if (content.length > RUN_LOG_MAX_BYTES) throw new HttpError(413, TOO_BIG);
  if (mode === "check") return json(await checkRunLog(content, fileName, user));
  return json(await commitRunLog(content, fileName, user, clientAddress ?? null), 201);
});

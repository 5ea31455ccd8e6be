import { RUN_LOG_MAX_BYTES } from "../../../lib/imports/run-log";
import { importQuery } from "../../../lib/schemas/imports";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { HttpError, json, queryOf, readBodyBytes, validate } from "../../../lib/server/http";
import { checkRunLog, commitRunLog, listImports } from "../../../lib/server/services/imports";
import { takeToken } from "../../../lib/server/rate-limit";
import { detectType } from "../../../lib/server/storage";

export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "create:import");
  return json({ items: await listImports() });
});

const TOO_BIG = `file: larger than ${RUN_LOG_MAX_BYTES / 1024 / 1024} MB; split it into smaller files`;

/**
 * The file as text. Run logs are UTF-8 (a spreadsheet's "CSV UTF-8"); a UTF-16 export or one in a
 * legacy encoding such as Latin-1 is refused with a message saying so, rather than read as garbage.
 */
function decodeRunLog(bytes: Uint8Array): string {
  if (bytes.byteLength === 0) throw new HttpError(400, "file: the file is empty; it needs a header row and at least one run");
  const binary = detectType(bytes);
  if (binary) throw new HttpError(400, `file: this is a ${binary.extension.toUpperCase()} file, not a CSV run log`);
  if (bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 0x03 && bytes[3] === 0x04)
    throw new HttpError(
      400,
      "file: this is a spreadsheet workbook (or another zip archive), not a CSV file; save it as CSV UTF-8 (comma-separated)",
    );
  const utf16 =
    (bytes[0] === 0xff && bytes[1] === 0xfe) ||
    (bytes[0] === 0xfe && bytes[1] === 0xff) ||
    (bytes.byteLength > 3 && (bytes[1] === 0 || bytes[0] === 0) && bytes.subarray(0, 64).filter((b) => b === 0).length >= 8);
  if (utf16) throw new HttpError(400, "file: this file is UTF-16 text; save it as CSV UTF-8 (comma-separated) and upload it again");
  const notUtf8 =
    "file: this file is not UTF-8 text (perhaps Latin-1 or another legacy encoding); save it as CSV UTF-8 (comma-separated) and upload it again";
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new HttpError(400, notUtf8);
  }
  // A browser that read a Latin-1 file as UTF-8 sends U+FFFD where the accented letters were.
  if (text.includes("\uFFFD")) throw new HttpError(400, notUtf8);
  return text;
}

export const POST = endpoint(async ({ locals, request, url, clientAddress }) => {
  const user = requirePermission(locals, "create:import");
  await takeToken(user.id, "import");
  const { mode, fileName } = validate(queryOf(url), importQuery);
  const type = (request.headers.get("content-type") ?? "").toLowerCase();
  if (!/^(text\/(csv|plain)|application\/(vnd\.ms-excel|octet-stream))/.test(type))
    throw new HttpError(415, "file: send the CSV file itself with content-type text/csv");
  const content = decodeRunLog(await readBodyBytes(request, RUN_LOG_MAX_BYTES, TOO_BIG));
  if (mode === "check") return json(await checkRunLog(content, fileName, user));
  return json(await commitRunLog(content, fileName, user, clientAddress ?? null), 201);
});

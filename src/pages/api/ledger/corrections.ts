import { correctionSchema } from "../../../lib/schemas/ledger";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { reverseEntries } from "../../../lib/server/services/ledger";

/** Reverses entries: 201 with the reversing entries. Entries are never edited or deleted. */
export const POST = endpoint(async ({ locals, request, clientAddress }) => {
  const user = requirePermission(locals, "create:correction");
  const input = await readJson(request, correctionSchema);
  return json(await reverseEntries(input, user, clientAddress ?? null), 201);
});

import { bottleParams, bottleUpdateSchema } from "../../../../../lib/schemas/preparation";
import { endpoint, requirePermission } from "../../../../../lib/server/guard";
import { json, readJson, validate } from "../../../../../lib/server/http";
import { undoBottle, updateBottle } from "../../../../../lib/server/services/bottles";

/** Marks one bottle in use, empty or discarded, or undoes the last of those within the undo window. */
export const POST = endpoint(async ({ locals, params, request, clientAddress }) => {
  const user = requirePermission(locals, "update:batch");
  const { id, number } = validate(params, bottleParams);
  const change = await readJson(request, bottleUpdateSchema);
  const { status, undo, ...rest } = change;
  const batch =
    undo || status === undefined
      ? await undoBottle(id, number, user, clientAddress)
      : await updateBottle(id, number, { ...rest, status }, user, clientAddress);
  return json({ batch });
});

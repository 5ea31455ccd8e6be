import { inviteUserSchema } from "../../../lib/schemas/auth";
import { endpoint, requirePermission } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { publicOrigin } from "../../../lib/server/mail";
import { inviteUser, listUsers } from "../../../lib/server/services/users";

export const GET = endpoint(async ({ locals }) => {
  requirePermission(locals, "manage:user");
  return json({ items: await listUsers() });
});

/** Invites a person: creates the account and mails a one-time link to choose a password. */
export const POST = endpoint(async ({ locals, request, clientAddress }) => {
  const actor = requirePermission(locals, "manage:user");
  const input = await readJson(request, inviteUserSchema);
  const result = await inviteUser(input, { actor, ip: clientAddress, origin: publicOrigin() });
  return json(result, 201);
});

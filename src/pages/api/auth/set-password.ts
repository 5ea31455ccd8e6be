import { setPasswordSchema } from "../../../lib/schemas/auth";
import { endpoint } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { setPasswordWithToken } from "../../../lib/server/services/account";

/** Public: the one-time token from an invitation or reset link is the credential. */
export const POST = endpoint(async ({ request, clientAddress }) => {
  const input = await readJson(request, setPasswordSchema);
  const { email } = await setPasswordWithToken(input, { ip: clientAddress });
  return json({ email });
});

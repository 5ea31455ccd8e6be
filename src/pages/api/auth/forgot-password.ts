import { forgotPasswordSchema } from "../../../lib/schemas/auth";
import { endpoint } from "../../../lib/server/guard";
import { json, readJson } from "../../../lib/server/http";
import { publicOrigin } from "../../../lib/server/mail";
import { FORGOT_PASSWORD_ANSWER, requestPasswordReset } from "../../../lib/server/services/account";

/** Public: answers the same whether or not the address has an account. */
export const POST = endpoint(async ({ request, clientAddress }) => {
  const { email } = await readJson(request, forgotPasswordSchema);
  // Not awaited: the time to answer must not tell whether a mail was sent.
  void requestPasswordReset(email, { ip: clientAddress, origin: publicOrigin() }).catch((error: unknown) => console.error(error));
  return json({ message: FORGOT_PASSWORD_ANSWER }, 202);
});

import { endpoint } from "../../../lib/server/guard";
import { json } from "../../../lib/server/http";
import { handlePaymentsWebhook } from "../../../lib/server/services/billing/webhooks";

/**
 * Public: the payments provider posts its events here, with no session. Trust comes from the
 * `Stripe-Signature` header, verified against the raw body with the endpoint secret; an unsigned
 * or badly signed request gets 400 and changes nothing. The origin check skips /api/webhooks/*.
 */
export const POST = endpoint(async ({ request }) => {
  const raw = await request.text();
  const outcome = await handlePaymentsWebhook(raw, request.headers.get("stripe-signature"));
  return json({ received: true, ...outcome });
});

import Stripe from "stripe";
import { getEnv, type Env } from "./env";
import { HttpError } from "./http";

type PaymentsEnv = Pick<Env, "PAYMENTS_HOST" | "PAYMENTS_PORT" | "PAYMENTS_PROTOCOL" | "PAYMENTS_SECRET_KEY">;

/**
 * The official SDK pointed at whatever the environment names: the local fake in development and
 * tests, the hosted service in production (PAYMENTS_HOST=api host, PAYMENTS_PORT=443,
 * PAYMENTS_PROTOCOL=https and a live key). Nothing in the code knows which it is.
 */
export function createPaymentsClient(env: PaymentsEnv): Stripe {
  if (!env.PAYMENTS_SECRET_KEY) throw new HttpError(503, "Invoicing is not configured: set PAYMENTS_SECRET_KEY.");
  return new Stripe(env.PAYMENTS_SECRET_KEY, {
    host: env.PAYMENTS_HOST,
    port: env.PAYMENTS_PORT,
    protocol: env.PAYMENTS_PROTOCOL,
    maxNetworkRetries: 2,
    timeout: 20_000,
    appInfo: { name: "Decant" },
  });
}

let client: Stripe | undefined;

export function getPayments(): Stripe {
  client ??= createPaymentsClient(getEnv());
  return client;
}

/** The endpoint secret that signs webhooks; without it every webhook is refused. */
export function webhookSecret(env: Pick<Env, "PAYMENTS_WEBHOOK_SECRET"> = getEnv()): string {
  if (!env.PAYMENTS_WEBHOOK_SECRET) throw new HttpError(503, "Webhooks are not configured: set PAYMENTS_WEBHOOK_SECRET.");
  return env.PAYMENTS_WEBHOOK_SECRET;
}

/**
 * What every call to the payments provider shares: the idempotency keys derived from a statement,
 * the mapping of the SDK's errors onto answers, and the provider's Unix timestamps.
 */
import Stripe from "stripe";
import { HttpError } from "../../http";
import type { Statement } from "../../models/billing";

/** The idempotency keys of a statement's provider calls: stable across retries, unique across databases. */
export function statementKey(statement: Pick<Statement, "id" | "createdAt" | "revision">) {
  return `decant-statement-${statement.id}-${statement.createdAt.getTime()}-r${statement.revision}`;
}

/** A provider failure as the answer the manager sees: 409 for a key reused with other contents, else 502. */
export function providerError(error: unknown): never {
  if (error instanceof Stripe.errors.StripeIdempotencyError) {
    throw new HttpError(
      409,
      `The payments service holds an earlier attempt for this statement with different contents (${error.message}).`,
    );
  }
  if (error instanceof Stripe.errors.StripeError) {
    throw new HttpError(502, `The payments service refused the request: ${error.message}`, { providerCode: error.code ?? null });
  }
  throw error;
}

export const fromUnix = (seconds: number | null | undefined) => (seconds ? new Date(seconds * 1000) : null);

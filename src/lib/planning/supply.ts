/**
 * Solvent that never runs out: how long what is on hand lasts at the use the ledger shows, and when
 * to order. Pure arithmetic; the service supplies on-hand amounts and used amounts.
 *
 * Use per day is the higher of the last-30-day and last-90-day rates, so a recent rise is not
 * averaged away. Reorder point = use per day × lead time + safety stock (the textbook reorder-point
 * rule, common practice). A reagent "runs out within its lead time" when its days of supply are
 * fewer than the lead time: an order placed today would arrive too late.
 */

export interface SupplyInput {
  /** Stock lots plus the reagent's share of live batches (mL, or g for solids). */
  onHand: number;
  used30: number;
  used90: number;
  leadTime_days: number;
  safetyStock: number;
}

export type SupplyState = "ok" | "reorder" | "runs-out";

export interface SupplyStatus {
  perDay30: number;
  perDay90: number;
  perDay: number;
  /** Infinity when nothing is used. */
  daysOfSupply: number;
  reorderPoint: number;
  state: SupplyState;
  /** Enough to reach the reorder point again plus 30 days of use, once an order arrives; 0 when none is due. */
  suggestedOrder: number;
}

/** Days of use an order covers beyond the reorder point (common practice: about a month). */
export const ORDER_COVER_DAYS = 30;

export function supplyStatus(input: SupplyInput): SupplyStatus {
  const perDay30 = Math.max(0, input.used30) / 30;
  const perDay90 = Math.max(0, input.used90) / 90;
  const perDay = Math.max(perDay30, perDay90);
  const onHand = Math.max(0, input.onHand);
  const daysOfSupply = perDay > 0 ? onHand / perDay : Number.POSITIVE_INFINITY;
  const reorderPoint = perDay * input.leadTime_days + input.safetyStock;
  const state: SupplyState =
    daysOfSupply < input.leadTime_days ? "runs-out" : onHand <= reorderPoint && reorderPoint > 0 ? "reorder" : "ok";
  const suggestedOrder = state === "ok" ? 0 : Math.max(0, reorderPoint + perDay * ORDER_COVER_DAYS - onHand);
  return { perDay30, perDay90, perDay, daysOfSupply, reorderPoint, state, suggestedOrder };
}

/** The day (UTC, YYYY-MM-DD) the reagent runs out at the current use, or null. */
export function runsOutOn(status: SupplyStatus, now: Date): string | null {
  if (!Number.isFinite(status.daysOfSupply)) return null;
  return new Date(now.getTime() + status.daysOfSupply * 86_400_000).toISOString().slice(0, 10);
}

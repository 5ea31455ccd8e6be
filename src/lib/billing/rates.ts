/**
 * Rates and costing, pure: which price was in force when an entry happened, and what an amount
 * costs at that price, in exact integer arithmetic (no float drift, one rounding per total).
 */

export type PriceList = "internal" | "external";
export type RateKind = "reagent" | "preparation_fee" | "injection_fee";
export type RateUnit = "L" | "g" | "batch" | "injection";

export interface Rate {
  id: number;
  kind: RateKind;
  reagentId: string | null;
  grade: string | null;
  priceList: PriceList;
  unit: RateUnit;
  /** Price per unit in integer minor units. */
  amount_minor: number;
  currency: string;
  /** First day (UTC, YYYY-MM-DD) on which the rate applies. */
  effectiveFrom: string;
}

export interface RateQuery {
  kind: RateKind;
  reagentId?: string | null;
  priceList: PriceList;
  currency: string;
  /** When the costed thing happened: a Date or a UTC day YYYY-MM-DD. */
  at: Date | string;
}

const dayOf = (at: Date | string) => (typeof at === "string" ? at.slice(0, 10) : at.toISOString().slice(0, 10));

/**
 * The rate in force at a time: the one with the latest effective-from day on or before that day
 * (a later-entered rate wins a tie). Rates that start later never apply, so a price change never
 * alters the cost of what happened before it.
 */
export function rateInForce(rates: readonly Rate[], query: RateQuery): Rate | null {
  const day = dayOf(query.at);
  let best: Rate | null = null;
  for (const rate of rates) {
    if (rate.kind !== query.kind || rate.priceList !== query.priceList || rate.currency !== query.currency) continue;
    if (query.kind === "reagent" && rate.reagentId !== query.reagentId) continue;
    // Grade-specific prices belong to the billing issue; the ledger costs at the reagent's general rate.
    if (rate.grade !== null) continue;
    if (rate.effectiveFrom > day) continue;
    if (supersedes(rate, best)) best = rate;
  }
  return best;
}

/** True when `rate` takes over from `other` for the same item: it starts later, or the same day and was entered later. */
export function supersedes(rate: Rate, other: Rate | null): boolean {
  return !other || rate.effectiveFrom > other.effectiveFrom || (rate.effectiveFrom === other.effectiveFrom && rate.id > other.id);
}

/** A rate on a given day: "current" (in force), "superseded" (a newer one took over) or "scheduled" (starts later). */
export type RateState = "current" | "superseded" | "scheduled";

/**
 * Each rate's state on `day` (YYYY-MM-DD), by id. Per price list, kind, reagent, grade and
 * currency, the rate in force that day is current; older ones are superseded, later ones scheduled.
 */
export function rateStates(rates: readonly Rate[], day: string): Map<number, RateState> {
  const inForce = new Map<string, Rate>();
  for (const rate of rates) {
    if (rate.effectiveFrom > day) continue;
    const key = [rate.priceList, rate.kind, rate.reagentId, rate.grade, rate.currency].join("|");
    if (supersedes(rate, inForce.get(key) ?? null)) inForce.set(key, rate);
  }
  const current = new Set([...inForce.values()].map((rate) => rate.id));
  return new Map(
    rates.map((rate) => [rate.id, current.has(rate.id) ? "current" : rate.effectiveFrom > day ? "scheduled" : "superseded"] as const),
  );
}

/** Quantities are scaled to integers of 10⁻⁶ (mL or g) before multiplying. */
const SCALE = 6;
/** Exact costs are kept in 10⁻⁹ minor units. */
const EXACT = 10n ** 9n;

/** "12.3456" or 12.3456 → 12345600n (10⁻⁶ units), rounding half away from zero past 6 digits. */
export function toMicro(value: string | number): bigint {
  const text = typeof value === "number" ? value.toFixed(SCALE + 2) : value.trim();
  const match = /^(-?)(\d*)(?:\.(\d*))?$/.exec(text);
  if (!match) throw new RangeError(`Not a decimal number: ${value}`);
  const [, sign, whole = "", fraction = ""] = match;
  const padded = (fraction + "0".repeat(SCALE + 1)).slice(0, SCALE + 1);
  let micro = BigInt((whole || "0") + padded.slice(0, SCALE));
  if (Number(padded[SCALE]) >= 5) micro += 1n;
  return sign === "-" ? -micro : micro;
}

/**
 * Exact cost (10⁻⁹ minor units) of a quantity at a rate: per litre for liquids (`volume_mL`),
 * per gram for solids (`mass_g`). Null when the rate's unit does not fit the quantity.
 */
export function exactCost(quantity: { volume_mL?: string | number | null; mass_g?: string | number | null }, rate: Rate): bigint | null {
  const price = BigInt(rate.amount_minor);
  if (rate.unit === "L") {
    if (quantity.volume_mL == null) return null;
    // (mL / 1000) × price × 10⁹ = (mL × 10⁶) × price: the micro-mL count times the price is exact.
    return toMicro(quantity.volume_mL) * price;
  }
  if (rate.unit === "g") {
    if (quantity.mass_g == null) return null;
    return toMicro(quantity.mass_g) * price * 1000n;
  }
  return null;
}

/** Rounds an exact cost to whole minor units, half away from zero. */
export function roundMinor(exact: bigint): number {
  const negative = exact < 0n;
  const abs = negative ? -exact : exact;
  const whole = abs / EXACT + ((abs % EXACT) * 2n >= EXACT ? 1n : 0n);
  return Number(negative ? -whole : whole);
}

export interface CostLine {
  reagentId: string;
  volume_mL?: string | number | null;
  mass_g?: string | number | null;
  at: Date | string;
}

export interface CostResult {
  amount_minor: number;
  currency: string;
  /** Reagents with quantity but no rate in force: not costed, so the total is a lower bound. */
  uncosted: string[];
}

/** Costs lines at the rates in force at each line's time; rounds once, on the total. */
export function costLines(
  lines: readonly CostLine[],
  rates: readonly Rate[],
  options: { priceList: PriceList; currency: string },
): CostResult {
  let exact = 0n;
  const uncosted = new Set<string>();
  for (const line of lines) {
    const hasVolume = line.volume_mL != null && toMicro(line.volume_mL) !== 0n;
    const hasMass = line.mass_g != null && toMicro(line.mass_g) !== 0n;
    if (!hasVolume && !hasMass) continue;
    const rate = rateInForce(rates, {
      kind: "reagent",
      reagentId: line.reagentId,
      priceList: options.priceList,
      currency: options.currency,
      at: line.at,
    });
    const cost = rate ? exactCost(hasMass && rate.unit === "g" ? { mass_g: line.mass_g } : { volume_mL: line.volume_mL }, rate) : null;
    if (cost === null) uncosted.add(line.reagentId);
    else exact += cost;
  }
  return { amount_minor: roundMinor(exact), currency: options.currency, uncosted: [...uncosted].sort() };
}

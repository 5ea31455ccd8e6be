/**
 * Money in Decant: an integer number of minor units (cents for EUR) with an ISO 4217 code.
 * Never a float of major units; arithmetic stays in integers and only `formatMoney` turns an
 * amount into text. Pure: runs in the browser and on the server.
 */
import { numberFormat } from "../format";

export interface Money {
  /** Integer minor units, e.g. 1234 for €12.34. */
  amount: number;
  /** ISO 4217 code, e.g. "EUR". */
  currency: string;
}

/** Digits after the decimal point for a currency: 2 for EUR, 0 for JPY. */
export function minorDigits(currency: string): number {
  return numberFormat("en", { style: "currency", currency }).resolvedOptions().maximumFractionDigits ?? 2;
}

/**
 * The one money formatter.
 *
 * @example formatMoney({ amount: 123456, currency: "EUR" }) // → "€1,234.56"
 * @example formatMoney({ amount: -250, currency: "EUR" })    // → "-€2.50"
 */
export function formatMoney(money: Money, locale = "en-GB"): string {
  if (!Number.isInteger(money.amount)) throw new RangeError(`Money amounts are integer minor units, got ${money.amount}`);
  const digits = minorDigits(money.currency);
  return numberFormat(locale, {
    style: "currency",
    currency: money.currency,
    minimumFractionDigits: digits,
    maximumFractionDigits: digits,
  }).format(money.amount / 10 ** digits);
}

/** Adds amounts of one currency; mixing currencies is a programming error. */
export function addMoney(a: Money, b: Money): Money {
  if (a.currency !== b.currency) throw new RangeError(`Cannot add ${a.currency} and ${b.currency}`);
  return { amount: a.amount + b.amount, currency: a.currency };
}

import { localDay, nextDay, startOfLocalDay } from "../format";

/**
 * The one definition of a reporting period, used by every screen and document (overview, usage,
 * statements, the waste report): whole days, the first and the last both included, as the
 * facility's local days. SQL reads the half-open instants [first day 00:00, the day after the
 * last 00:00) in the facility's zone, so a March in Europe/Berlin is 31 days less one hour.
 */
export interface DayPeriod {
  /** First day, YYYY-MM-DD, included. */
  from: string;
  /** Last day, YYYY-MM-DD, included. */
  to: string;
}

/** Half-open bounds [start, end) of the local days `from` to `to`, both included, in `timeZone`. */
export function periodBounds(from: string, to: string, timeZone: string): [Date, Date] {
  return [startOfLocalDay(from, timeZone), startOfLocalDay(nextDay(to), timeZone)];
}

/** The same bounds as an object, for SQL replacements. */
export function periodInstants(period: DayPeriod, timeZone: string): { start: Date; end: Date } {
  const [start, end] = periodBounds(period.from, period.to, timeZone);
  return { start, end };
}

/** "The last 30 days": the `days` whole local days ending today, today included. */
export function lastDays(days: number, now: Date, timeZone: string): DayPeriod {
  const to = localDay(now, timeZone);
  const back = new Date(Date.parse(`${to}T00:00:00Z`) - (days - 1) * 86_400_000).toISOString().slice(0, 10);
  return { from: back, to };
}

/** What a period covers, said on screen and in documents. */
export function describePeriod(period: DayPeriod, timeZone: string): string {
  return `${period.from} to ${period.to}, both days included (local days, ${timeZone})`;
}

/** First and last local day of a month "YYYY-MM" (calendar arithmetic; the zone decides the instants). */
export function monthDays(month: string): { from: string; to: string } {
  const [y, m] = month.split("-").map(Number) as [number, number];
  const last = new Date(Date.UTC(y, m, 0)).getUTCDate();
  return { from: `${month}-01`, to: `${month}-${String(last).padStart(2, "0")}` };
}

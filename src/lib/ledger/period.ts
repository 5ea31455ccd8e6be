import { nextDay, startOfLocalDay } from "../format";

/**
 * Half-open bounds [start, end) of a period whose `from` and `to` days are both included, as the
 * facility's local days: exactly the instants of those days in `timeZone`, across a change of the
 * clocks (a March in Europe/Berlin is 31 days less one hour).
 */
export function periodBounds(from: string, to: string, timeZone: string): [Date, Date] {
  return [startOfLocalDay(from, timeZone), startOfLocalDay(nextDay(to), timeZone)];
}

/** First and last local day of a month "YYYY-MM" (calendar arithmetic; the zone decides the instants). */
export function monthDays(month: string): { from: string; to: string } {
  const [y, m] = month.split("-").map(Number) as [number, number];
  const last = new Date(Date.UTC(y, m, 0)).getUTCDate();
  return { from: `${month}-01`, to: `${month}-${String(last).padStart(2, "0")}` };
}

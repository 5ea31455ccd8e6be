/**
 * The one definition of a reporting period, used by every screen and document (overview, usage,
 * statements, the waste report): whole days, both the first and the last included, as UTC days
 * for now (the facility's time zone is to replace UTC here, and only here). SQL reads the
 * half-open instants [first day 00:00, the day after the last 00:00).
 */

export interface DayPeriod {
  /** First day, YYYY-MM-DD, included. */
  from: string;
  /** Last day, YYYY-MM-DD, included. */
  to: string;
}

const DAY_MS = 86_400_000;
const dayOf = (instant: Date) => instant.toISOString().slice(0, 10);

/** The day after a day. */
export const dayAfter = (day: string) => dayOf(new Date(Date.parse(`${day}T00:00:00Z`) + DAY_MS));

/** The day a moment falls on. */
export const dayAt = (instant: Date) => dayOf(instant);

/** "The last 30 days": the `days` whole days ending today, today included. */
export function lastDays(days: number, now: Date): DayPeriod {
  const to = dayOf(now);
  return { from: dayOf(new Date(Date.parse(`${to}T00:00:00Z`) - (days - 1) * DAY_MS)), to };
}

/** Half-open instants for SQL: [from 00:00, the day after `to` 00:00). */
export function periodInstants(period: DayPeriod): { start: Date; end: Date } {
  return { start: new Date(`${period.from}T00:00:00.000Z`), end: new Date(`${dayAfter(period.to)}T00:00:00.000Z`) };
}

/** What a period covers, said on screen and in documents. */
export function describePeriod(period: DayPeriod): string {
  return `${period.from} to ${period.to}, both days included (UTC days)`;
}

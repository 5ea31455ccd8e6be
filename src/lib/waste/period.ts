/** Reporting periods for the waste view: calendar month, quarter or year (days as `lib/ledger/period.ts` defines them). */

export type PeriodPreset = "month" | "quarter" | "year";

export interface Period {
  /** YYYY-MM-DD, inclusive. */
  from: string;
  /** YYYY-MM-DD, inclusive. */
  to: string;
}

const iso = (d: Date) => d.toISOString().slice(0, 10);

/** The calendar month, quarter or year that contains `day`. */
export function periodFor(preset: PeriodPreset, day: Date): Period {
  const y = day.getUTCFullYear();
  const m = day.getUTCMonth();
  const startMonth = preset === "month" ? m : preset === "quarter" ? m - (m % 3) : 0;
  const months = preset === "month" ? 1 : preset === "quarter" ? 3 : 12;
  const from = new Date(Date.UTC(y, startMonth, 1));
  const to = new Date(Date.UTC(y, startMonth + months, 0));
  return { from: iso(from), to: iso(to) };
}

/** The period just before, of the same length in calendar units. */
export function previousPeriod(preset: PeriodPreset, day: Date): Period {
  const y = day.getUTCFullYear();
  const m = day.getUTCMonth();
  const back =
    preset === "month"
      ? new Date(Date.UTC(y, m - 1, 1))
      : preset === "quarter"
        ? new Date(Date.UTC(y, m - (m % 3) - 3, 1))
        : new Date(Date.UTC(y - 1, 0, 1));
  return periodFor(preset, back);
}

/** "2026-11" for each month the period touches, in order. */
export function monthsIn(period: Period): string[] {
  const out: string[] = [];
  const d = new Date(`${period.from.slice(0, 7)}-01T00:00:00Z`);
  const last = period.to.slice(0, 7);
  while (iso(d).slice(0, 7) <= last && out.length < 120) {
    out.push(iso(d).slice(0, 7));
    d.setUTCMonth(d.getUTCMonth() + 1);
  }
  return out;
}

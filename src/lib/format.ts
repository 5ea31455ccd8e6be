// Display formatting shared by pages and islands. Dates are shown in ISO 8601 order.

/** "2026-12-01 14:05" in UTC. */
export function formatDateTime(iso: string | Date): string {
  const d = typeof iso === "string" ? new Date(iso) : iso;
  return d.toISOString().slice(0, 16).replace("T", " ");
}

/** "2026-12-01". */
export function formatDate(iso: string | Date): string {
  const d = typeof iso === "string" ? new Date(iso) : iso;
  return d.toISOString().slice(0, 10);
}

const numberFormats = new Map<string, Intl.NumberFormat>();

/**
 * A shared `Intl.NumberFormat` per locale and options. Building one is far dearer than using it
 * (`toLocaleString` with options builds one on every call), and a page may format thousands.
 */
export function numberFormat(locale: string, options: Intl.NumberFormatOptions = {}): Intl.NumberFormat {
  const key = `${locale}|${JSON.stringify(options)}`;
  let format = numberFormats.get(key);
  if (!format) {
    format = new Intl.NumberFormat(locale, options);
    numberFormats.set(key, format);
  }
  return format;
}

/** A number with thousands separators and at most `maximumFractionDigits`, e.g. 12345.678 → "12,345.68". */
export function formatNumber(value: number, maximumFractionDigits = 0): string {
  return numberFormat("en-GB", { maximumFractionDigits }).format(value);
}

/** Volumes: mL below a litre, L above, e.g. 950 → "950 mL", 12 345 → "12.35 L". */
export function formatVolume(mL: number): string {
  if (Math.abs(mL) >= 1000) return `${formatNumber(mL / 1000, 2)} L`;
  return `${formatNumber(mL, 1)} mL`;
}

// ---------------------------------------------------------------------------------------------
// The facility's time zone and locale. Decant stores instants in UTC and shows them, and reads
// typed wall-clock times, in the facility's IANA zone. The platform's Intl does all of it: the
// offset of a zone at an instant comes from `formatToParts`, and the reverse (a wall-clock time
// to an instant) tries the offsets in force a day either side, which covers every real zone
// (transitions are weeks apart). No time-zone library is needed.

/** What formatting needs of the facility settings (`GET /api/settings/facility`). */
export interface Zoned {
  /** IANA zone, e.g. "Europe/Berlin". */
  timeZone: string;
  /** BCP 47 locale for dates and numbers, e.g. "de-DE". */
  locale: string;
}

const dateTimeFormats = new Map<string, Intl.DateTimeFormat>();
function dateTimeFormat(locale: string, options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  const key = `${locale}|${JSON.stringify(options)}`;
  let format = dateTimeFormats.get(key);
  if (!format) {
    format = new Intl.DateTimeFormat(locale, options);
    dateTimeFormats.set(key, format);
  }
  return format;
}

/** The platform's name for an IANA zone ("europe/berlin" → "Europe/Berlin"), or null for an unknown one. */
export function canonicalTimeZone(zone: string): string | null {
  if (!/^[A-Za-z_]+(?:\/[A-Za-z0-9_+-]+)*$/.test(zone)) return null;
  try {
    return new Intl.DateTimeFormat("en", { timeZone: zone }).resolvedOptions().timeZone;
  } catch {
    return null;
  }
}

/** True when the locale is well formed and the platform formats in it (not only a fallback). */
export function isLocale(locale: string): boolean {
  try {
    const [canonical] = Intl.getCanonicalLocales(locale);
    return canonical !== undefined && Intl.DateTimeFormat.supportedLocalesOf([canonical]).length === 1;
  } catch {
    return false;
  }
}

interface WallClock {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
}

/** The wall-clock reading in `timeZone` at `instant`. */
export function wallClock(instant: Date, timeZone: string): WallClock {
  const parts = dateTimeFormat("en-US", {
    timeZone,
    hourCycle: "h23",
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    second: "2-digit",
  }).formatToParts(instant);
  const get = (type: Intl.DateTimeFormatPartTypes) => Number(parts.find((p) => p.type === type)?.value);
  return { year: get("year"), month: get("month"), day: get("day"), hour: get("hour") % 24, minute: get("minute"), second: get("second") };
}

const wallMs = (w: WallClock) => Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute, w.second);

/** Minutes the zone is ahead of UTC at `instant` (Europe/Berlin in July: 120). */
export function utcOffsetMinutes(instant: Date, timeZone: string): number {
  const ms = Math.floor(instant.getTime() / 1000) * 1000;
  return Math.round((wallMs(wallClock(new Date(ms), timeZone)) - ms) / 60_000);
}

const pad = (n: number, width = 2) => String(n).padStart(width, "0");

/** The local day ("YYYY-MM-DD") of an instant in the zone. */
export function localDay(instant: Date, timeZone: string): string {
  const w = wallClock(instant, timeZone);
  return `${pad(w.year, 4)}-${pad(w.month)}-${pad(w.day)}`;
}

/** "YYYY-MM-DDTHH:MM" in the zone, the value of a datetime-local input. */
export function localInputValue(instant: Date, timeZone: string): string {
  const w = wallClock(instant, timeZone);
  return `${pad(w.year, 4)}-${pad(w.month)}-${pad(w.day)}T${pad(w.hour)}:${pad(w.minute)}`;
}

/** The instants whose wall clock reads `wall` (ms of the reading taken as UTC): none in a gap, two in a repeat. */
function instantsAt(wall: number, timeZone: string): number[] {
  const offsets = new Set([-1, 1].map((side) => utcOffsetMinutes(new Date(wall + side * 86_400_000), timeZone)));
  const found = [...offsets].map((o) => wall - o * 60_000).filter((t) => wallMs(wallClock(new Date(t), timeZone)) === wall);
  return [...new Set(found)].sort((a, b) => a - b);
}

/** The first instant of a local day in the zone (midnight, or the first minute after a gap at midnight). */
export function startOfLocalDay(day: string, timeZone: string): Date {
  const [y, m, d] = day.split("-").map(Number) as [number, number, number];
  const midnight = Date.UTC(y, m - 1, d);
  for (let minute = 0; minute <= 180; minute += 1) {
    const at = instantsAt(midnight + minute * 60_000, timeZone);
    if (at.length > 0) return new Date(at[0]!);
  }
  throw new RangeError(`no start of ${day} in ${timeZone}`);
}

/** The day after a day "YYYY-MM-DD" (calendar arithmetic, no zone). */
export function nextDay(day: string): string {
  const d = new Date(`${day}T00:00:00.000Z`);
  d.setUTCDate(d.getUTCDate() + 1);
  return d.toISOString().slice(0, 10);
}

export type LocalTimeReading =
  | { ok: true; instant: Date; /** Set when the time occurred twice and the rule chose the first. */ repeated?: true }
  | { ok: false; message: string };

/**
 * A typed wall-clock time ("YYYY-MM-DDTHH:MM[:SS]", as a datetime-local input gives it) in the
 * facility's zone, as an instant. The stated rules at a change of the clocks:
 * - a time in the hour the clocks skip (spring) does not exist: refused, naming the change;
 * - a time in the hour that happens twice (autumn) is the FIRST occurrence (before the clocks go
 *   back); append the offset (e.g. "+01:00") to mean the second one.
 * A text with its own offset or "Z" is read as it says.
 */
export function parseLocalDateTime(text: string, timeZone: string): LocalTimeReading {
  const trimmed = text.trim().replace(" ", "T");
  if (/(?:Z|[+-]\d{2}:?\d{2})$/i.test(trimmed)) {
    const d = new Date(trimmed);
    return Number.isNaN(d.getTime()) ? { ok: false, message: "Enter the date and time as YYYY-MM-DD HH:MM" } : { ok: true, instant: d };
  }
  const match = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2})(?:\.\d+)?)?$/.exec(trimmed);
  if (!match) return { ok: false, message: "Enter the date and time as YYYY-MM-DD HH:MM" };
  const [y, mo, d, h, mi, s] = match.slice(1).map((v) => Number(v ?? 0)) as [number, number, number, number, number, number];
  const wall = Date.UTC(y, mo - 1, d, h, mi, s);
  const check = new Date(wall);
  if (check.getUTCMonth() !== mo - 1 || check.getUTCDate() !== d || h > 23 || mi > 59 || s > 59) {
    return { ok: false, message: "is not a date and time in the calendar" };
  }
  const at = instantsAt(wall, timeZone);
  if (at.length === 0) {
    const skipped = utcOffsetMinutes(new Date(wall + 86_400_000), timeZone) - utcOffsetMinutes(new Date(wall - 86_400_000), timeZone);
    return {
      ok: false,
      message: `${pad(h)}:${pad(mi)} does not exist on ${pad(y, 4)}-${pad(mo)}-${pad(d)} in ${timeZone}: the clocks go forward ${skipped} minutes then. Enter the time the clock showed.`,
    };
  }
  return at.length > 1 ? { ok: true, instant: new Date(at[0]!), repeated: true } : { ok: true, instant: new Date(at[0]!) };
}

/** The zone's short name at an instant in the locale ("CET", "CEST", "GMT-7"). */
export function zoneName(instant: Date, facility: Zoned): string {
  const parts = dateTimeFormat(facility.locale, { timeZone: facility.timeZone, timeZoneName: "short", hour: "numeric" }).formatToParts(
    instant,
  );
  return parts.find((p) => p.type === "timeZoneName")?.value ?? facility.timeZone;
}

/** An instant in the facility's zone and locale, with the zone's name: "29 Mar 2026, 03:30 CEST" (en-GB). */
export function formatInstant(value: string | Date, facility: Zoned): string {
  const d = typeof value === "string" ? new Date(value) : value;
  const text = dateTimeFormat(facility.locale, {
    timeZone: facility.timeZone,
    year: "numeric",
    month: "short",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  }).format(d);
  return `${text} ${zoneName(d, facility)}`;
}

/**
 * An instant for a bottle label: ISO 8601 order in the facility's zone with the zone's English
 * short name, "2026-03-29 03:30 CEST", so a bottle reads the same to everyone at the bench and
 * prints in the label fonts (Latin characters only).
 */
export function formatLabelInstant(value: string | Date, timeZone: string): string {
  const d = typeof value === "string" ? new Date(value) : value;
  return `${localInputValue(d, timeZone).replace("T", " ")} ${zoneName(d, { timeZone, locale: "en-GB" })}`;
}

/**
 * A day in the facility's locale: a "YYYY-MM-DD" day as it is, an instant as its local day in the
 * facility's zone. "29 Mar 2026" (en-GB), "29. März 2026" (de-DE).
 */
export function formatDay(value: string | Date, facility: Zoned): string {
  const day = typeof value === "string" && /^\d{4}-\d{2}-\d{2}$/.test(value) ? value : localDay(new Date(value), facility.timeZone);
  return dateTimeFormat(facility.locale, { timeZone: "UTC", year: "numeric", month: "short", day: "2-digit" }).format(
    new Date(`${day}T00:00:00.000Z`),
  );
}

/** A month "YYYY-MM" in the locale: "March 2026". */
export function formatMonth(month: string, facility: Zoned): string {
  return dateTimeFormat(facility.locale, { timeZone: "UTC", year: "numeric", month: "long" }).format(new Date(`${month}-01T00:00:00.000Z`));
}

/** An instant as ISO 8601 with the facility's offset, for CSV files: "2026-03-29T03:30:00+02:00". */
export function isoWithOffset(value: string | Date, timeZone: string): string {
  const d = typeof value === "string" ? new Date(value) : value;
  const offset = utcOffsetMinutes(d, timeZone);
  const w = wallClock(d, timeZone);
  const sign = offset < 0 ? "-" : "+";
  const abs = Math.abs(offset);
  return `${pad(w.year, 4)}-${pad(w.month)}-${pad(w.day)}T${pad(w.hour)}:${pad(w.minute)}:${pad(w.second)}${sign}${pad(Math.floor(abs / 60))}:${pad(abs % 60)}`;
}

/**
 * The zone's offset changes between two years (inclusive), for the database's local-day sums:
 * each entry is the instant an offset starts and the offset (minutes ahead of UTC). The first
 * starts at `fromYear`-01-01. Scans week by week (the zones' changes are months apart) and
 * narrows each change to the minute.
 */
export function offsetChanges(timeZone: string, fromYear: number, toYear: number): { startsAt: Date; offsetMinutes: number }[] {
  const start = Date.UTC(fromYear, 0, 1);
  const end = Date.UTC(toYear + 1, 0, 1);
  const changes = [{ startsAt: new Date(start), offsetMinutes: utcOffsetMinutes(new Date(start), timeZone) }];
  const WEEK = 7 * 86_400_000;
  let previous = changes[0]!.offsetMinutes;
  for (let t = start + WEEK; t < end + WEEK; t += WEEK) {
    const offset = utcOffsetMinutes(new Date(t), timeZone);
    if (offset === previous) continue;
    let lo = t - WEEK; // offset `previous`
    let hi = t; // offset `offset`
    while (hi - lo > 60_000) {
      const mid = lo + Math.floor((hi - lo) / 120_000) * 60_000;
      if (utcOffsetMinutes(new Date(mid), timeZone) === previous) lo = mid;
      else hi = mid;
    }
    changes.push({ startsAt: new Date(hi), offsetMinutes: offset });
    previous = offset;
  }
  return changes;
}

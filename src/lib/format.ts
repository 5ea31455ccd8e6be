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

/** "2026-12-01 15:05 CET": a moment as the wall clock reads in `timeZone` (an IANA zone), with the zone's short name. */
export function formatInstantInZone(iso: string | Date, timeZone: string): string {
  const d = typeof iso === "string" ? new Date(iso) : iso;
  const parts = Object.fromEntries(
    new Intl.DateTimeFormat("en-GB", {
      timeZone,
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      hourCycle: "h23",
      timeZoneName: "short",
    })
      .formatToParts(d)
      .map((p) => [p.type, p.value]),
  );
  return `${parts.year}-${parts.month}-${parts.day} ${parts.hour}:${parts.minute} ${parts.timeZoneName}`;
}

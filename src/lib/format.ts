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

/** Volumes: mL below a litre, L above, e.g. 950 → "950 mL", 12 345 → "12.35 L". */
export function formatVolume(mL: number): string {
  if (Math.abs(mL) >= 1000) return `${(mL / 1000).toLocaleString("en-GB", { maximumFractionDigits: 2 })} L`;
  return `${mL.toLocaleString("en-GB", { maximumFractionDigits: 1 })} mL`;
}

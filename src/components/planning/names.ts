/** Names an island shows for ids (reagents, streams), passed in from the page. */
export interface Names {
  reagents: Record<string, string>;
  streams: Record<string, string>;
}

export function reagentName(names: Names, id: string): string {
  if (id.startsWith("channel:")) return `Channel ${id.slice(8)} (not named)`;
  if (id.startsWith("blend:")) return `Blend on channel ${id.slice(6)}`;
  return names.reagents[id] ?? id;
}

export const streamName = (names: Names, id: string) => names.streams[id] ?? id;

/** Litres from mL, with a sign when asked. */
export function litres(mL: number, signed = false): string {
  const v = mL / 1000;
  const text = Math.abs(v) >= 100 ? v.toFixed(0) : Math.abs(v) >= 1 ? v.toFixed(2) : v.toFixed(3);
  return `${signed && v > 0 ? "+" : ""}${text.replace("-", "−")} L`;
}

/**
 * The opaque cursor of a keyset-paged list: the sort it belongs to and the last row's sort value
 * and id. A cursor made under another sort is refused rather than silently misread.
 */

export type SortValue = string | number | { t: string };

interface CursorBody {
  s: string;
  d: "asc" | "desc";
  v: SortValue;
  i: number;
}

export interface Cursor {
  sort: string;
  dir: "asc" | "desc";
  /** The last row's sort value; dates travel as `{ t: ISO 8601 }`. */
  value: string | number | Date;
  id: number;
}

function toBase64Url(text: string): string {
  const bytes = new TextEncoder().encode(text);
  let binary = "";
  for (const b of bytes) binary += String.fromCharCode(b);
  return btoa(binary).replace(/\+/g, "-").replace(/\//g, "_").replace(/=+$/, "");
}

function fromBase64Url(text: string): string {
  const binary = atob(text.replace(/-/g, "+").replace(/_/g, "/"));
  return new TextDecoder().decode(Uint8Array.from(binary, (c) => c.charCodeAt(0)));
}

export function encodeCursor(cursor: Cursor): string {
  const v: SortValue = cursor.value instanceof Date ? { t: cursor.value.toISOString() } : cursor.value;
  const body: CursorBody = { s: cursor.sort, d: cursor.dir, v, i: cursor.id };
  return toBase64Url(JSON.stringify(body));
}

/** The cursor, or null when the text is not one of ours (the caller answers 400). */
export function decodeCursor(text: string): Cursor | null {
  let body: unknown;
  try {
    body = JSON.parse(fromBase64Url(text));
  } catch {
    return null;
  }
  if (!body || typeof body !== "object") return null;
  const { s, d, v, i } = body as Partial<CursorBody>;
  if (typeof s !== "string" || (d !== "asc" && d !== "desc") || typeof i !== "number" || !Number.isSafeInteger(i)) return null;
  if (typeof v === "string" || (typeof v === "number" && Number.isFinite(v))) return { sort: s, dir: d, value: v, id: i };
  if (v && typeof v === "object" && typeof v.t === "string") {
    const date = new Date(v.t);
    return Number.isNaN(date.getTime()) ? null : { sort: s, dir: d, value: date, id: i };
  }
  return null;
}

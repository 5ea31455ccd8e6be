// A small MIME reader: enough for the messages nodemailer writes (multipart/alternative and
// multipart/mixed, quoted-printable / base64 / 7bit / 8bit bodies, RFC 2047 encoded words).

export interface ParsedMessage {
  /** Top-level headers, names lower-cased; repeated headers joined with a newline. */
  headers: Record<string, string>;
  from: string;
  to: string[];
  subject: string;
  date: string | null;
  text: string;
  html: string;
}

interface Part {
  headers: Record<string, string>;
  body: string; // bytes as latin1 characters
}

function splitPart(raw: string): Part {
  const match = /\r?\n\r?\n/.exec(raw);
  const head = match ? raw.slice(0, match.index) : raw;
  const body = match ? raw.slice(match.index + match[0].length) : "";
  const headers: Record<string, string> = {};
  for (const line of head.replace(/\r?\n[ \t]+/g, " ").split(/\r?\n/)) {
    const colon = line.indexOf(":");
    if (colon <= 0) continue;
    const name = line.slice(0, colon).trim().toLowerCase();
    const value = line.slice(colon + 1).trim();
    headers[name] = name in headers ? `${headers[name]}\n${value}` : value;
  }
  return { headers, body };
}

function param(header: string | undefined, name: string): string | null {
  if (!header) return null;
  const match = new RegExp(`;\\s*${name}\\s*=\\s*(?:"([^"]*)"|([^;\\s]+))`, "i").exec(header);
  return match ? (match[1] ?? match[2] ?? null) : null;
}

function bytesOf(latin1: string): Buffer {
  return Buffer.from(latin1, "latin1");
}

function decodeText(bytes: Buffer, charset: string | null): string {
  try {
    return new TextDecoder(charset ?? "utf-8").decode(bytes);
  } catch {
    return new TextDecoder("utf-8").decode(bytes);
  }
}

function decodeQuotedPrintable(text: string, inHeader = false): Buffer {
  const source = inHeader ? text.replace(/_/g, " ") : text.replace(/=\r?\n/g, "");
  const out: number[] = [];
  for (let i = 0; i < source.length; i++) {
    const ch = source[i]!;
    const hex = source.slice(i + 1, i + 3);
    if (ch === "=" && /^[0-9A-Fa-f]{2}$/.test(hex)) {
      out.push(parseInt(hex, 16));
      i += 2;
    } else {
      out.push(source.charCodeAt(i) & 0xff);
    }
  }
  return Buffer.from(out);
}

/** Decodes RFC 2047 encoded words (`=?UTF-8?Q?...?=`, `=?UTF-8?B?...?=`) in a header value. */
export function decodeHeader(value: string): string {
  const raw = value.replace(/(=\?[^?]+\?[BbQq]\?[^?]*\?=)\s+(?==\?)/g, "$1");
  const decoded = raw.replace(/=\?([^?]+)\?([BbQq])\?([^?]*)\?=/g, (_all, charset: string, kind: string, text: string) => {
    const bytes = kind.toUpperCase() === "B" ? Buffer.from(text, "base64") : decodeQuotedPrintable(text, true);
    return decodeText(bytes, charset.split("*")[0] ?? null);
  });
  // Raw 8-bit header bytes are UTF-8 in practice.
  return /[\x80-\xff]/.test(decoded) && !/=\?/.test(value) ? decodeText(bytesOf(decoded), "utf-8") : decoded;
}

function decodeBody(part: Part): string {
  const encoding = (part.headers["content-transfer-encoding"] ?? "7bit").toLowerCase();
  const charset = param(part.headers["content-type"], "charset");
  const bytes =
    encoding === "base64"
      ? Buffer.from(part.body.replace(/\s+/g, ""), "base64")
      : encoding === "quoted-printable"
        ? decodeQuotedPrintable(part.body)
        : bytesOf(part.body);
  return decodeText(bytes, charset);
}

function walk(part: Part, found: { text: string; html: string }) {
  const type = (part.headers["content-type"] ?? "text/plain").toLowerCase();
  const disposition = (part.headers["content-disposition"] ?? "").toLowerCase();
  if (type.startsWith("multipart/")) {
    const boundary = param(part.headers["content-type"], "boundary");
    if (!boundary) return;
    const pieces = part.body.split(
      new RegExp(`(?:^|\\r?\\n)--${boundary.replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}(?:--)?[ \\t]*(?:\\r?\\n|$)`),
    );
    // The first piece is the preamble and the last the epilogue.
    for (const piece of pieces.slice(1, -1)) walk(splitPart(piece), found);
    return;
  }
  if (disposition.startsWith("attachment")) return;
  if (type.startsWith("text/html") && !found.html) found.html = decodeBody(part);
  else if (type.startsWith("text/plain") && !found.text) found.text = decodeBody(part);
}

/** Reads a message as received over SMTP (bytes). */
export function parseMessage(raw: Buffer): ParsedMessage {
  const top = splitPart(raw.toString("latin1"));
  const headers = Object.fromEntries(Object.entries(top.headers).map(([k, v]) => [k, decodeHeader(v)]));
  const found = { text: "", html: "" };
  walk(top, found);
  const to = (headers["to"] ?? "")
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean);
  return {
    headers,
    from: headers["from"] ?? "",
    to,
    subject: headers["subject"] ?? "",
    date: headers["date"] ? new Date(headers["date"]).toISOString() : null,
    text: found.text,
    html: found.html,
  };
}

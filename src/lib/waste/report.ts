/**
 * The safety officer's waste report for a period, as CSV and as PDF. Pure: it takes the figures,
 * the server gathers them. Volumes in the CSV are mL with up to 4 decimals (the ledger's precision).
 */
import { PDFDocument, rgb, type PDFFont, type PDFPage } from "pdf-lib";
import { formatLabelInstant } from "../format";
import { embedLabelFonts, sanitizer } from "../labels/label-pdf";

export interface ReportData {
  facility: string;
  /** ISO 8601 with the facility's offset. */
  generatedAt: string;
  /** The facility's zone; the period's days are its local days. */
  timeZone: string;
  period: { from: string; to: string };
  total_mL: number;
  streams: { stream: string; name: string; volume_mL: number }[];
  byRoom: { room: string; streams: Record<string, number>; volume_mL: number }[];
  byProject: { projectCode: string; projectName: string; volume_mL: number; streams: Record<string, number> }[];
  byMonth: { month: string; streams: Record<string, number>; volume_mL: number }[];
  containers: {
    code: string;
    stream: string;
    room: string;
    status: string;
    estimated_mL: number;
    capacity_mL: number;
    fill_percent: number;
    since: string | null;
  }[];
  flammables: { room: string; onHand_L: number; limit_L: number | null; state: string }[];
}

const CAUTION =
  "Follow your institution's hazardous-waste procedures and local regulations. Limits shown are the site's settings (example values unless changed); fire codes and the institution decide the real limits.";

function csvCell(value: string | number): string {
  const s = typeof value === "number" ? String(Math.round(value * 10_000) / 10_000) : value;
  // Quote anything with a separator, quote or line break; neutralise spreadsheet formulas.
  const safe = /^[=+\-@]/.test(s) && typeof value === "string" ? `'${s}` : s;
  return /[",\n\r]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** One long table: section, key, stream, volume_mL — easy to pivot in a spreadsheet. */
export function reportCsv(data: ReportData): string {
  const rows: (string | number)[][] = [["section", "key", "stream", "volume_mL"]];
  for (const s of data.streams) rows.push(["stream", s.stream, s.stream, s.volume_mL]);
  for (const r of data.byRoom) for (const [stream, v] of Object.entries(r.streams)) rows.push(["room", r.room, stream, v]);
  for (const p of data.byProject) for (const [stream, v] of Object.entries(p.streams)) rows.push(["project", p.projectCode, stream, v]);
  for (const m of data.byMonth) for (const [stream, v] of Object.entries(m.streams)) rows.push(["month", m.month, stream, v]);
  rows.push(["total", `${data.period.from}..${data.period.to}`, "", data.total_mL]);
  return rows.map((r) => r.map(csvCell).join(",")).join("\r\n") + "\r\n";
}

const INK = rgb(0.11, 0.15, 0.2);
const MUTED = rgb(0.37, 0.42, 0.47);
const RULE = rgb(0.86, 0.85, 0.81);
const A4 = { width: 595.28, height: 841.89 };
const MARGIN = 48;

const litres = (mL: number) => (Math.abs(mL) >= 1000 ? `${(mL / 1000).toFixed(2)} L` : `${mL.toFixed(1)} mL`);

export async function reportPdf(data: ReportData): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  doc.setTitle(`Waste report ${data.period.from} to ${data.period.to}`);
  doc.setCreator("Decant");
  doc.setProducer("Decant (pdf-lib)");
  const fonts = await embedLabelFonts(doc);
  const clean = sanitizer(fonts.regular);
  let page: PDFPage = doc.addPage([A4.width, A4.height]);
  let y = A4.height - MARGIN;
  const newPageIfNeeded = (space: number) => {
    if (y - space < MARGIN + 20) {
      page = doc.addPage([A4.width, A4.height]);
      y = A4.height - MARGIN;
    }
  };
  const write = (text: string, x: number, size: number, font: PDFFont = fonts.regular, color = INK) =>
    page.drawText(clean(text), { x, y, size, font, color });
  const right = (text: string, xRight: number, size: number, font: PDFFont = fonts.regular) => {
    const t = clean(text);
    page.drawText(t, { x: xRight - font.widthOfTextAtSize(t, size), y, size, font, color: INK });
  };
  const heading = (text: string) => {
    newPageIfNeeded(48);
    y -= 22;
    write(text, MARGIN, 12, fonts.bold);
    y -= 6;
    page.drawLine({ start: { x: MARGIN, y }, end: { x: A4.width - MARGIN, y }, thickness: 0.6, color: RULE });
    y -= 14;
  };
  const table = (columns: { title: string; x: number; align?: "right" }[], rows: string[][]) => {
    newPageIfNeeded(30);
    for (const c of columns) c.align === "right" ? right(c.title, c.x, 8, fonts.bold) : write(c.title, c.x, 8, fonts.bold, MUTED);
    y -= 13;
    for (const row of rows) {
      newPageIfNeeded(14);
      row.forEach((cell, i) => {
        const c = columns[i]!;
        if (c.align === "right") right(cell, c.x, 9);
        else write(cell.length > 48 ? `${cell.slice(0, 47)}…` : cell, c.x, 9);
      });
      y -= 13;
    }
    if (rows.length === 0) {
      write("Nothing in this period.", MARGIN, 9, fonts.regular, MUTED);
      y -= 13;
    }
  };

  write("Solvent waste report", MARGIN, 18, fonts.bold);
  y -= 18;
  write(
    `${data.facility} · period ${data.period.from} to ${data.period.to} · generated ${formatLabelInstant(data.generatedAt, data.timeZone)}`,
    MARGIN,
    9,
    fonts.regular,
    MUTED,
  );
  y -= 16;
  write(`Total routed to waste: ${litres(data.total_mL)} (runs, draws and discards in Decant's ledger)`, MARGIN, 10);

  const R = A4.width - MARGIN;
  heading("By stream");
  table(
    [
      { title: "Stream", x: MARGIN },
      { title: "Volume", x: R - 90, align: "right" },
      { title: "Share", x: R, align: "right" },
    ],
    data.streams.map((s) => [
      s.name,
      litres(s.volume_mL),
      data.total_mL > 0 ? `${((s.volume_mL / data.total_mL) * 100).toFixed(1)} %` : "—",
    ]),
  );

  heading("By room (of the container)");
  table(
    [
      { title: "Room", x: MARGIN },
      { title: "Streams", x: MARGIN + 90 },
      { title: "Volume", x: R, align: "right" },
    ],
    data.byRoom.map((r) => [
      r.room,
      Object.entries(r.streams)
        .map(([k, v]) => `${data.streams.find((s) => s.stream === k)?.name ?? k} ${litres(v)}`)
        .join("; "),
      litres(r.volume_mL),
    ]),
  );

  heading("By month");
  table(
    [
      { title: "Month", x: MARGIN },
      { title: "Volume", x: R, align: "right" },
    ],
    data.byMonth.map((m) => [m.month, litres(m.volume_mL)]),
  );

  heading("By project");
  table(
    [
      { title: "Project", x: MARGIN },
      { title: "Name", x: MARGIN + 90 },
      { title: "Volume", x: R, align: "right" },
    ],
    data.byProject.map((p) => [p.projectCode, p.projectName, litres(p.volume_mL)]),
  );

  heading("Containers on site now");
  table(
    [
      { title: "Code", x: MARGIN },
      { title: "Stream", x: MARGIN + 60 },
      { title: "Room", x: MARGIN + 200 },
      { title: "State", x: MARGIN + 250 },
      { title: "Since", x: MARGIN + 340 },
      { title: "Fill", x: R, align: "right" },
    ],
    data.containers.map((c) => [
      c.code,
      c.stream,
      c.room,
      c.status.replace("_", " "),
      c.since ?? "—",
      `${litres(c.estimated_mL)} / ${litres(c.capacity_mL)} (${c.fill_percent} %)`,
    ]),
  );

  heading("Flammable liquids on hand");
  table(
    [
      { title: "Room", x: MARGIN },
      { title: "On hand", x: MARGIN + 200, align: "right" },
      { title: "Room limit", x: MARGIN + 300, align: "right" },
      { title: "State", x: MARGIN + 330 },
    ],
    data.flammables.map((f) => [f.room, `${f.onHand_L.toFixed(1)} L`, f.limit_L === null ? "not set" : `${f.limit_L} L`, f.state]),
  );

  newPageIfNeeded(40);
  y -= 16;
  const words = CAUTION.split(" ");
  let line = "";
  for (const w of words) {
    const next = line ? `${line} ${w}` : w;
    if (fonts.regular.widthOfTextAtSize(next, 8.5) > A4.width - 2 * MARGIN) {
      write(line, MARGIN, 8.5, fonts.regular, MUTED);
      y -= 11;
      line = w;
    } else line = next;
  }
  if (line) write(line, MARGIN, 8.5, fonts.regular, MUTED);
  return doc.save();
}

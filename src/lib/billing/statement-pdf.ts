/**
 * A statement as PDF (pdf-lib, A4, the app's own IBM Plex Sans embedded as a subset — the same
 * font files the bottle labels use). Lines grouped by project with subtotals; drafts are marked.
 * Pure: the statement in, the PDF's bytes out; the billing services load what it shows.
 */
import { PDFDocument, rgb, type PDFFont, type PDFPage } from "pdf-lib";
import { embedLabelFonts, sanitizer } from "../labels/label-pdf";
import { formatMoney } from "./money";
import { projectTotals, quantityLabel as quantityText, type StatementLine } from "./statement";
import type { InvoiceView, StatementView } from "./types";
import { INK, textDrawer } from "./pdf-text";

/** What the statement PDF shows: the statement as the screens see it, plus the facility's name. */
export type StatementPdfInput = Pick<
  StatementView,
  | "reference"
  | "clientName"
  | "clientKind"
  | "costCentre"
  | "billingEmail"
  | "periodStart"
  | "periodEnd"
  | "status"
  | "issuedAt"
  | "lines"
  | "total_minor"
  | "currency"
> & {
  facility: string;
  invoice: Pick<InvoiceView, "number" | "dueOn" | "hostedUrl" | "status"> | null;
};

const A4 = { width: 595.28, height: 841.89 };
const MARGIN = 48;
const MUTED = rgb(0.37, 0.42, 0.47);
const RULE = rgb(0.86, 0.85, 0.81);
const TEAL = rgb(0.08, 0.37, 0.4);
const AMBER = rgb(0.54, 0.29, 0.03);

function priceText(line: StatementLine, currency: string): string {
  if (line.unitPrice_minor === null) return "no rate";
  return `${formatMoney({ amount: line.unitPrice_minor, currency })} / ${line.rateUnit}`;
}

export async function renderStatementPdf(input: StatementPdfInput): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  const { regular, bold } = await embedLabelFonts(doc);
  const clean = sanitizer(regular);
  const money = (amount: number) => formatMoney({ amount, currency: input.currency });
  const title = input.clientKind === "internal" ? "Chargeback statement" : "Statement of charges";
  doc.setTitle(`${title} ${input.reference}`);
  doc.setAuthor(input.facility);
  doc.setCreator("Decant");
  doc.setProducer("Decant (pdf-lib)");

  const pages: PDFPage[] = [];
  let page!: PDFPage;
  let y = 0;

  const { onPage, text, right, fit } = textDrawer(clean, regular);

  const COL = { item: MARGIN, quantity: 360, price: 460, amount: A4.width - MARGIN };
  const tableHeader = () => {
    text("Item", COL.item, y, 8.5, bold, MUTED);
    right("Quantity", COL.quantity, y, 8.5, bold, MUTED);
    right("Price", COL.price, y, 8.5, bold, MUTED);
    right("Amount", COL.amount, y, 8.5, bold, MUTED);
    y -= 6;
    page.drawLine({ start: { x: MARGIN, y }, end: { x: A4.width - MARGIN, y }, thickness: 0.8, color: RULE });
    y -= 14;
  };

  const newPage = (first: boolean) => {
    page = doc.addPage([A4.width, A4.height]);
    pages.push(page);
    onPage(page);
    y = A4.height - MARGIN;
    if (first) {
      page.drawRectangle({ x: 0, y: A4.height - 6, width: A4.width, height: 6, color: TEAL });
      text(input.facility, MARGIN, y - 8, 15, bold);
      text("Prepared with Decant", MARGIN, y - 24, 8.5, regular, MUTED);
      right(title, A4.width - MARGIN, y - 8, 13, bold, TEAL);
      right(input.reference, A4.width - MARGIN, y - 24, 9.5);
      right(`Period ${input.periodStart} to ${input.periodEnd}`, A4.width - MARGIN, y - 37, 9.5);
      right(input.issuedAt ? `Issued ${input.issuedAt.slice(0, 10)}` : "Not issued", A4.width - MARGIN, y - 50, 9.5, regular, MUTED);
      y -= 82;
      text("For", MARGIN, y, 8.5, bold, MUTED);
      text(input.clientName, MARGIN, y - 15, 11.5, bold);
      const detail = input.clientKind === "internal" ? `Cost centre ${input.costCentre ?? "not set"}` : (input.billingEmail ?? "");
      text(detail, MARGIN, y - 29, 9.5);
      y -= 50;
      if (input.status !== "issued") {
        const note =
          input.status === "draft"
            ? "DRAFT for review: figures follow the ledger until the statement is issued."
            : "VOID: this statement was cancelled.";
        page.drawRectangle({ x: MARGIN, y: y - 6, width: A4.width - 2 * MARGIN, height: 20, color: rgb(0.98, 0.94, 0.85) });
        text(note, MARGIN + 8, y, 9.5, bold, AMBER);
        y -= 30;
      }
    } else {
      text(
        `${input.reference} · ${input.clientName} · ${input.periodStart} to ${input.periodEnd} (continued)`,
        MARGIN,
        y - 8,
        9,
        regular,
        MUTED,
      );
      y -= 30;
    }
    tableHeader();
  };
  const ensure = (height: number) => {
    if (y - height < MARGIN + 40) newPage(false);
  };

  newPage(true);
  const totals = projectTotals(input.lines);
  for (const project of totals) {
    ensure(40);
    text(fit(`${project.projectCode}  ${project.projectName}`, COL.amount - MARGIN, 10, bold), MARGIN, y, 10, bold);
    y -= 15;
    for (const line of input.lines.filter((l) => l.projectCode === project.projectCode)) {
      ensure(16);
      // A price that changed during the period: say from when each line's price applies.
      const from = line.rateEffectiveFrom && line.rateEffectiveFrom > input.periodStart ? ` (price from ${line.rateEffectiveFrom})` : "";
      text(fit(line.description + from, COL.quantity - MARGIN - 90, 9.5), MARGIN + 10, y, 9.5);
      right(quantityText(line), COL.quantity, y, 9.5);
      right(priceText(line, input.currency), COL.price, y, 9.5, regular, line.unitPrice_minor === null ? AMBER : INK);
      right(money(line.amount_minor), COL.amount, y, 9.5);
      y -= 14;
    }
    ensure(18);
    page.drawLine({ start: { x: COL.price - 60, y: y + 8 }, end: { x: COL.amount, y: y + 8 }, thickness: 0.5, color: RULE });
    right(`Subtotal ${project.projectCode}`, COL.price, y - 3, 9, regular, MUTED);
    right(money(project.amount_minor), COL.amount, y - 3, 9.5, bold);
    y -= 26;
  }
  if (totals.length === 0) {
    text("No chargeable use in this period.", MARGIN, y, 10, regular, MUTED);
    y -= 24;
  }
  ensure(60);
  page.drawLine({ start: { x: MARGIN, y: y + 6 }, end: { x: A4.width - MARGIN, y: y + 6 }, thickness: 1.2, color: INK });
  text("Total", MARGIN, y - 12, 12, bold);
  right(money(input.total_minor), COL.amount, y - 12, 13, bold);
  y -= 40;
  if (input.invoice && input.invoice.status !== "draft") {
    ensure(50);
    const due = input.invoice.dueOn ? `, due ${input.invoice.dueOn}` : "";
    text(`Invoice ${input.invoice.number ?? ""}${due} · ${input.invoice.status}`, MARGIN, y, 10, bold, TEAL);
    if (input.invoice.hostedUrl && input.invoice.status === "open")
      text(fit(`Pay online: ${input.invoice.hostedUrl}`, A4.width - 2 * MARGIN, 9), MARGIN, y - 14, 9);
    y -= 34;
  } else if (input.clientKind === "internal" && input.status === "issued") {
    ensure(30);
    text(
      `Charged back to cost centre ${input.costCentre ?? "not set"} through the finance office's journal.`,
      MARGIN,
      y,
      9.5,
      regular,
      MUTED,
    );
  }

  pages.forEach((p, index) => {
    const label = clean(`${input.reference} · page ${index + 1} of ${pages.length}`);
    p.drawText(label, { x: A4.width - MARGIN - regular.widthOfTextAtSize(label, 8), y: MARGIN - 20, size: 8, font: regular, color: MUTED });
    p.drawText(clean("Volumes from the facility's solvent ledger, costed at the rates in force on each day."), {
      x: MARGIN,
      y: MARGIN - 20,
      size: 8,
      font: regular,
      color: MUTED,
    });
  });
  return doc.save();
}

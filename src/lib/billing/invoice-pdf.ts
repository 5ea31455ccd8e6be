/**
 * An invoice as PDF (pdf-lib, A4, IBM Plex Sans as on statements and labels): the facility's and
 * the client's details, Decant's own number tied to the statement it bills, one line per charge
 * with its tax, totals, terms, remit-to and the note. Pure: the frozen details in, bytes out.
 */
import { PDFDocument, rgb, type PDFFont, type PDFPage } from "pdf-lib";
import { embedLabelFonts, sanitizer } from "../labels/label-pdf";
import type { InvoiceDetails } from "./invoice";
import { formatMoney } from "./money";
import type { InvoiceStatus } from "./types";
import { textDrawer } from "./pdf-text";

export interface InvoicePdfInput {
  details: InvoiceDetails;
  status: InvoiceStatus;
}

const A4 = { width: 595.28, height: 841.89 };
const MARGIN = 48;
const MUTED = rgb(0.37, 0.42, 0.47);
const RULE = rgb(0.86, 0.85, 0.81);
const TEAL = rgb(0.08, 0.37, 0.4);
const AMBER = rgb(0.54, 0.29, 0.03);

const lines = (text: string | null | undefined) => (text ?? "").split(/\r?\n/).filter((line) => line.trim() !== "");

export async function renderInvoicePdf({ details, status }: InvoicePdfInput): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  const { regular, bold } = await embedLabelFonts(doc);
  const clean = sanitizer(regular);
  const money = (amount: number) => formatMoney({ amount, currency: details.currency });
  doc.setTitle(`Invoice ${details.number}`);
  doc.setAuthor(details.facility.legalName);
  doc.setCreator("Decant");
  doc.setProducer("Decant (pdf-lib)");

  const pages: PDFPage[] = [];
  let page!: PDFPage;
  let y = 0;
  const { onPage, text, right, fit } = textDrawer(clean, regular);
  const taxed = details.tax.percent !== null;
  const COL = { item: MARGIN, net: taxed ? 400 : 470, tax: 470, amount: A4.width - MARGIN };
  const tableHeader = () => {
    text("Description", COL.item, y, 8.5, bold, MUTED);
    right("Net", COL.net, y, 8.5, bold, MUTED);
    if (taxed) right(`${details.tax.label} ${details.tax.percent} %`, COL.tax, y, 8.5, bold, MUTED);
    right("Amount", COL.amount, y, 8.5, bold, MUTED);
    y -= 6;
    page.drawLine({ start: { x: MARGIN, y }, end: { x: A4.width - MARGIN, y }, thickness: 0.8, color: RULE });
    y -= 14;
  };
  const newPage = () => {
    page = doc.addPage([A4.width, A4.height]);
    pages.push(page);
    onPage(page);
    y = A4.height - MARGIN;
  };
  const ensure = (height: number) => {
    if (y - height >= MARGIN + 40) return;
    newPage();
    text(`Invoice ${details.number} (continued)`, MARGIN, y - 8, 9, regular, MUTED);
    y -= 30;
  };

  newPage();
  page.drawRectangle({ x: 0, y: A4.height - 6, width: A4.width, height: 6, color: TEAL });
  const { facility, client } = details;
  text(facility.legalName, MARGIN, y - 8, 14, bold);
  let left = y - 24;
  for (const line of lines(facility.address)) {
    text(line, MARGIN, left, 9);
    left -= 12;
  }
  if (facility.taxId) {
    text(`Tax id ${facility.taxId}`, MARGIN, left, 9);
    left -= 12;
  }
  right("Invoice", A4.width - MARGIN, y - 8, 15, bold, TEAL);
  const meta = [
    `No. ${details.number}`,
    `Issued ${details.issuedOn}`,
    `Due ${details.dueOn}`,
    `Statement ${details.statementReference}`,
    `Period ${details.periodStart} to ${details.periodEnd}`,
  ];
  meta.forEach((line, index) => right(line, A4.width - MARGIN, y - 24 - index * 12.5, 9.5, index === 0 ? bold : regular));
  y = Math.min(left, y - 24 - meta.length * 12.5) - 18;

  text("Bill to", MARGIN, y, 8.5, bold, MUTED);
  y -= 14;
  text(client.name, MARGIN, y, 11, bold);
  y -= 13;
  for (const line of [
    ...lines(client.address),
    ...(client.taxId ? [`Tax id ${client.taxId}`] : []),
    ...(client.purchaseOrder ? [`Purchase order ${client.purchaseOrder}`] : []),
    ...(client.email ? [client.email] : []),
  ]) {
    text(line, MARGIN, y, 9.5);
    y -= 12;
  }
  y -= 12;
  if (status === "void" || status === "uncollectible") {
    const note = status === "void" ? "VOID: this invoice was cancelled; its number is kept." : "Written off as uncollectible.";
    page.drawRectangle({ x: MARGIN, y: y - 6, width: A4.width - 2 * MARGIN, height: 20, color: rgb(0.98, 0.94, 0.85) });
    text(note, MARGIN + 8, y, 9.5, bold, AMBER);
    y -= 30;
  }

  tableHeader();
  for (const line of details.lines) {
    ensure(16);
    const price = line.unitPrice_minor === null ? "" : ` at ${money(line.unitPrice_minor)} / ${line.rateUnit}`;
    text(fit(`${line.projectCode} · ${line.description}${price}`, COL.net - MARGIN - 70, 9), MARGIN, y, 9);
    right(money(line.amount_minor), COL.net, y, 9);
    if (taxed) right(money(line.tax_minor), COL.tax, y, 9);
    right(money(line.amount_minor + line.tax_minor), COL.amount, y, 9);
    y -= 14;
  }
  ensure(90);
  page.drawLine({ start: { x: MARGIN, y: y + 6 }, end: { x: A4.width - MARGIN, y: y + 6 }, thickness: 0.8, color: RULE });
  y -= 8;
  const totalRow = (label: string, amount: number, font = regular, size = 10) => {
    right(label, COL.tax - 70, y, size, font);
    right(money(amount), COL.amount, y, size, font);
    y -= size + 6;
  };
  totalRow("Subtotal", details.subtotal_minor);
  if (taxed) totalRow(`${details.tax.label} ${details.tax.percent} %`, details.tax_minor);
  else totalRow("Tax", 0);
  totalRow(`Total due (${details.currency})`, details.total_minor, bold, 12);
  y -= 8;
  if (details.tax.legend) {
    ensure(20);
    text(details.tax.legend, MARGIN, y, 9.5, bold);
    y -= 18;
  }
  ensure(30);
  text("Payment terms", MARGIN, y, 8.5, bold, MUTED);
  y -= 13;
  text(`${facility.paymentTermsDays} days net: please pay by ${details.dueOn}, quoting ${details.number}.`, MARGIN, y, 9.5);
  y -= 18;
  if (lines(facility.remitTo).length) {
    ensure(20 + 12 * lines(facility.remitTo).length);
    text("Remit to", MARGIN, y, 8.5, bold, MUTED);
    y -= 13;
    for (const line of lines(facility.remitTo)) {
      text(line, MARGIN, y, 9.5);
      y -= 12;
    }
    y -= 6;
  }
  if (lines(facility.note).length) {
    ensure(20);
    text("Note", MARGIN, y, 8.5, bold, MUTED);
    y -= 13;
    for (const line of lines(facility.note)) {
      ensure(12);
      text(fit(line, A4.width - 2 * MARGIN, 9), MARGIN, y, 9);
      y -= 12;
    }
  }

  pages.forEach((p, index) => {
    const label = clean(`${details.number} · page ${index + 1} of ${pages.length}`);
    p.drawText(label, { x: A4.width - MARGIN - regular.widthOfTextAtSize(label, 8), y: MARGIN - 20, size: 8, font: regular, color: MUTED });
    p.drawText(clean(`Bills statement ${details.statementReference}; figures from the facility's solvent ledger.`), {
      x: MARGIN,
      y: MARGIN - 20,
      size: 8,
      font: regular,
      color: MUTED,
    });
  });
  return doc.save();
}

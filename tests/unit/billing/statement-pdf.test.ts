// The statement PDF from its data alone: a real PDF that pdf-lib reads back, titled for the
// client's kind, and as many A4 pages as the lines need.
import { PDFDocument } from "pdf-lib";
import { describe, expect, it } from "vitest";
import type { StatementLine } from "../../../src/lib/billing/statement";
import { renderStatementPdf, type StatementPdfInput } from "../../../src/lib/billing/statement-pdf";

const line = (index: number): StatementLine => ({
  projectCode: `QFT-IMP-${String(index % 7).padStart(3, "0")}`,
  projectName: "Impurity profiling",
  kind: "reagent",
  reagentId: "acetonitrile",
  description: `Acetonitrile (HPLC) ${index}`,
  quantity: "1250",
  quantityUnit: "mL",
  rateId: 1,
  unitPrice_minor: 7900,
  rateUnit: "L",
  rateEffectiveFrom: "2025-01-01",
  amount_minor: 9875,
});

const statement = (over: Partial<StatementPdfInput> = {}): StatementPdfInput => ({
  facility: "Veldmoor Separation Science Core",
  reference: "ST-000042",
  clientName: "Quillfeather Analytical",
  clientKind: "external",
  costCentre: null,
  billingEmail: "accounts@quillfeather.test",
  periodStart: "2026-11-01",
  periodEnd: "2026-11-30",
  status: "issued",
  issuedAt: "2026-12-02T09:30:00.000Z",
  lines: [line(1), line(2)],
  total_minor: 19_750,
  currency: "EUR",
  invoice: { number: "QF-0007", dueOn: "2027-01-01", hostedUrl: "http://127.0.0.1:1/i/in_1", status: "open" },
  ...over,
});

describe("renderStatementPdf", () => {
  it("is a one-page A4 PDF for a short statement, titled for an external client, by the facility", async () => {
    const doc = await PDFDocument.load(await renderStatementPdf(statement()));
    expect(doc.getPageCount()).toBe(1);
    const { width, height } = doc.getPage(0).getSize();
    expect([Math.round(width), Math.round(height)]).toEqual([595, 842]); // A4 in points (ISO 216: 210 × 297 mm)
    expect(doc.getTitle()).toBe("Statement of charges ST-000042");
    expect(doc.getAuthor()).toBe("Veldmoor Separation Science Core");
  });

  it("is a chargeback statement for an internal client", async () => {
    const internal = statement({ clientKind: "internal", costCentre: "CC-4102", billingEmail: null, invoice: null });
    expect((await PDFDocument.load(await renderStatementPdf(internal))).getTitle()).toBe("Chargeback statement ST-000042");
  });

  it("continues on further pages when the lines do not fit on one", async () => {
    const lines = Array.from({ length: 120 }, (_, i) => line(i));
    const doc = await PDFDocument.load(await renderStatementPdf(statement({ lines, total_minor: 120 * 9875 })));
    expect(doc.getPageCount()).toBeGreaterThanOrEqual(3);
  });

  it("renders a draft with no lines and characters the font lacks", async () => {
    const draft = statement({ status: "draft", issuedAt: null, lines: [], total_minor: 0, invoice: null, clientName: "Ωmega 測試 Lab" });
    expect((await PDFDocument.load(await renderStatementPdf(draft))).getPageCount()).toBe(1);
  });
});

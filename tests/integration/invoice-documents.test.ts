// Invoices a finance office accepts, against a real MariaDB and the payments fake through the SDK:
// the PDF (read back with pdftotext) carries every element an invoice needs, its lines, tax and
// total equal the provider's invoice to the cent, and Decant's numbers stay gap-free when twenty
// invoice runs race, some of them failing half-way.
import { QueryTypes } from "sequelize";
import type Stripe from "stripe";
import { describe, expect, it } from "vitest";
import type { InvoiceDetails } from "../../src/lib/billing/invoice";
import { formatMoney } from "../../src/lib/billing/money";
import { monthBounds } from "../../src/lib/billing/statement";
import { getEnv } from "../../src/lib/server/env";
import type { SignedInUser } from "../../src/lib/server/guard";
import { Invoice } from "../../src/lib/server/models/billing";
import { createPaymentsClient } from "../../src/lib/server/payments";
import { jsonColumn } from "../../src/lib/server/query";
import { invoicePdf } from "../../src/lib/server/services/billing/documents";
import { invoiceStatement } from "../../src/lib/server/services/billing/statement-invoice";
import { openStatement } from "../../src/lib/server/services/billing/statements";
import { useServiceDatabase } from "../support/service-database";
import { pdfText } from "../support/pdf-text";

const db = useServiceDatabase();
const manager = { id: 2, email: "manager@demo.test", name: "Priya Castellan", role: "manager", clientId: null } as SignedInUser;
const QUILLFEATHER = 4; // demo: standard VAT 21 %, purchase order PO-QT-2026-118
const TARNBROOK = 5; // demo: reverse charge
const payments = () => createPaymentsClient(getEnv());
const now = new Date();
const monthsAgo = (n: number) => monthBounds(new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - n, 1)).toISOString().slice(0, 7));

const pdftotext = (bytes: Uint8Array) => pdfText(bytes);

async function detailsOf(invoiceId: number): Promise<InvoiceDetails> {
  return jsonColumn<InvoiceDetails>((await Invoice.findByPk(invoiceId))!.details);
}

describe("an invoice a finance office accepts", () => {
  let standard: { invoiceId: number; providerId: string };

  it("carries Decant's own number, tied to its statement; the provider's id stays internal", async () => {
    const { id } = await openStatement({ clientId: QUILLFEATHER, ...monthsAgo(1) }, manager);
    const { invoice } = await invoiceStatement(id, {}, manager);
    standard = { invoiceId: invoice.id, providerId: invoice.providerInvoiceId! };
    expect(invoice.number).toMatch(new RegExp(`^VSC-${now.getUTCFullYear()}-\\d{5}$`));
    expect(invoice.statementReference).toMatch(/^ST-\d{6}$/);
    const remote = await payments().invoices.retrieve(invoice.providerInvoiceId!);
    expect(remote.number).toBe(invoice.number);
  });

  it("its lines, tax and total equal the provider's invoice to the cent", async () => {
    const details = await detailsOf(standard.invoiceId);
    const remote = await payments().invoices.retrieve(standard.providerId);
    expect(details.lines.length).toBeGreaterThan(0);
    expect(details.tax).toMatchObject({ treatment: "standard", label: "VAT", percent: "21" });
    expect(remote.subtotal).toBe(details.subtotal_minor);
    expect(remote.total).toBe(details.total_minor);
    expect(remote.total - remote.subtotal).toBe(details.tax_minor);
    expect(details.tax_minor).toBeGreaterThan(0);
    const remoteLines = remote.lines.data as unknown as { amount: number; description: string; tax_amounts: { amount: number }[] }[];
    expect(remoteLines.map((l) => [l.amount, l.tax_amounts.reduce((s, t) => s + t.amount, 0)])).toEqual(
      details.lines.map((l) => [l.amount_minor, l.tax_minor]),
    );
    // 21 % per line, rounded half away from zero to the cent (common VAT practice, per line).
    for (const line of details.lines) expect(line.tax_minor).toBe(Math.round((line.amount_minor * 21) / 100));
    const invoice = (await Invoice.findByPk(standard.invoiceId))!;
    expect(invoice.amountMinor).toBe(remote.total);
  });

  it("the PDF names both parties, the number, the statement, each line with tax, totals, terms and remit-to", async () => {
    const details = await detailsOf(standard.invoiceId);
    const text = pdftotext((await invoicePdf(standard.invoiceId, manager)).bytes);
    const money = (amount: number) => formatMoney({ amount, currency: details.currency });
    for (const required of [
      "Invoice",
      details.number,
      `Statement ${details.statementReference}`,
      `Period ${details.periodStart} to ${details.periodEnd}`,
      `Issued ${details.issuedOn}`,
      `Due ${details.dueOn}`,
      "Veldmoor Institute for Applied Sciences",
      "Kestrel Lane 14",
      "Tax id XX 482 117 930",
      "Quillfeather Therapeutics",
      "Harbour Row 7",
      "Tax id XX 301 775 204",
      "Purchase order PO-QT-2026-118",
      "VAT 21 %",
      "Subtotal",
      money(details.subtotal_minor),
      money(details.tax_minor),
      money(details.total_minor),
      "Payment terms",
      "30 days net",
      "Remit to",
      "Account XX00 VELD 0000 4821 17",
      "Note",
    ])
      expect(text, required).toContain(required);
    for (const line of details.lines.slice(0, 5)) {
      expect(text).toContain(money(line.amount_minor));
      expect(text).toContain(money(line.tax_minor));
    }
  });

  it("a reverse-charge client's invoice shows 0 % tax with its legend, at the provider too", async () => {
    const { id } = await openStatement({ clientId: TARNBROOK, ...monthsAgo(2) }, manager);
    const { invoice } = await invoiceStatement(id, {}, manager);
    const details = await detailsOf(invoice.id);
    expect(details.tax_minor).toBe(0);
    const remote = await payments().invoices.retrieve(invoice.providerInvoiceId!);
    expect(remote.total).toBe(details.total_minor);
    expect(remote.subtotal).toBe(details.subtotal_minor);
    const text = pdftotext((await invoicePdf(invoice.id, manager)).bytes);
    expect(text).toContain("VAT 0 %");
    expect(text).toContain("Reverse charge: the customer accounts for the tax.");
    expect(text).toContain("Tax id YY 5518 2290");
  });
});

/** A payments client whose finalize fails: the run rolls back after it took a number and made provider objects. */
function failingAtFinalize(real: Stripe): Stripe {
  const invoices = new Proxy(real.invoices, {
    get(target, property, receiver) {
      if (property === "finalizeInvoice") return async () => Promise.reject(new Error("connection reset while finalizing"));
      return Reflect.get(target, property, receiver) as unknown;
    },
  });
  return new Proxy(real, { get: (target, property) => (property === "invoices" ? invoices : Reflect.get(target, property)) });
}

describe("invoice numbers", () => {
  it("stay gap-free under 20 concurrent invoice runs, a quarter of which fail half-way", async () => {
    const before = await db.sequelize.query<{ n: number | null }>("SELECT MAX(last_number) AS n FROM invoice_sequences", {
      type: QueryTypes.SELECT,
    });
    const start = before[0]?.n ?? 0;
    // Twenty one-day statements on days with use, in months the tests above left open for each client.
    const statements: number[] = [];
    for (const [clientId, month] of [
      [QUILLFEATHER, monthsAgo(2)],
      [TARNBROOK, monthsAgo(1)],
    ] as const) {
      const days = await db.sequelize.query<{ day: string }>(
        `SELECT DISTINCT DATE_FORMAT(le.occurred_at, '%Y-%m-%d') AS day FROM ledger_entries le JOIN projects p ON p.id = le.project_id
          WHERE p.client_id = :clientId AND le.occurred_at >= :start AND le.occurred_at < DATE_ADD(:end, INTERVAL 1 DAY) ORDER BY day LIMIT 10`,
        { type: QueryTypes.SELECT, replacements: { clientId, start: month.periodStart, end: month.periodEnd } },
      );
      for (const { day } of days) statements.push((await openStatement({ clientId, periodStart: day, periodEnd: day }, manager)).id);
    }
    expect(statements.length).toBeGreaterThanOrEqual(12);
    const real = payments();
    const runs = await Promise.allSettled(
      statements.map((id, index) =>
        invoiceStatement(id, {}, manager, null, { payments: index % 4 === 3 ? failingAtFinalize(real) : real }),
      ),
    );
    const sent = runs.flatMap((r) => (r.status === "fulfilled" ? [r.value.invoice] : []));
    expect(sent.length).toBeGreaterThanOrEqual(8);
    const failedOnPurpose = runs.filter((r) => r.status === "rejected" && /connection reset|payments service/i.test(String(r.reason)));
    expect(failedOnPurpose.length).toBeGreaterThan(0);
    const sequence = sent.map((invoice) => Number(invoice.number!.split("-").at(-1))).sort((a, b) => a - b);
    expect(sequence).toEqual(sequence.map((_, index) => start + index + 1));
    // Every number is at the provider on exactly one finalized invoice.
    for (const invoice of sent) expect((await real.invoices.retrieve(invoice.providerInvoiceId!)).number).toBe(invoice.number);
  });
});

// Billing against a real MariaDB (a database of this file's own) and the payments fake, through
// the official SDK; the last block goes through the running app, the fake's webhooks included.
import { QueryTypes } from "sequelize";
import Stripe from "stripe";
import { describe, expect, it } from "vitest";
import { monthBounds } from "../../src/lib/billing/statement";
import { localDay, startOfLocalDay } from "../../src/lib/format";
import { getEnv } from "../../src/lib/server/env";
import type { SignedInUser } from "../../src/lib/server/guard";
import { HttpError } from "../../src/lib/server/http";
import { AuditEntry } from "../../src/lib/server/models/audit";
import { Invoice, ProcessedEvent } from "../../src/lib/server/models/billing";
import { Client } from "../../src/lib/server/models/organisation";
import { createPaymentsClient } from "../../src/lib/server/payments";
import { chargebackJournal } from "../../src/lib/server/services/billing/documents";
import { listInvoices } from "../../src/lib/server/services/billing/invoices";
import { isPeriodLocked, openDateFor } from "../../src/lib/server/services/billing/period-locks";
import { addRate } from "../../src/lib/server/services/billing/rates";
import { invoiceStatement } from "../../src/lib/server/services/billing/statement-invoice";
import { issueStatement } from "../../src/lib/server/services/billing/statement-issue";
import { computeStatement } from "../../src/lib/server/services/billing/statement-lines";
import { getStatement, listStatements, openStatement } from "../../src/lib/server/services/billing/statements";
import { handlePaymentsWebhook } from "../../src/lib/server/services/billing/webhooks";
import { client as httpClient } from "../support/http";
import { useServiceDatabase } from "../support/service-database";

const db = useServiceDatabase();
const manager = { id: 2, email: "manager@demo.test", name: "Priya Castellan", role: "manager", clientId: null } as SignedInUser;
const contact = { id: 5, email: "client@demo.test", name: "Jun Okabe", role: "client", clientId: 4 } as SignedInUser;
const QUILLFEATHER = 4;
const TARNBROOK = 5;
const PLANT_GROUP = 1;

const now = new Date();
const lastMonth = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 1, 1)).toISOString().slice(0, 7);
const twoMonthsAgo = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 2, 1)).toISOString().slice(0, 7);
const period = monthBounds(lastMonth);
const earlier = monthBounds(twoMonthsAgo);
const fakeBase = () => `http://127.0.0.1:${getEnv().PAYMENTS_PORT}`;
const payments = () => createPaymentsClient(getEnv());

async function fakeJson<T>(path: string, init?: RequestInit): Promise<T> {
  const response = await fetch(fakeBase() + path, init);
  if (!response.ok) throw new Error(`${path} answered ${response.status}: ${await response.text()}`);
  return (await response.json()) as T;
}

async function ledgerSum(clientId: number, reagentId: string, range: { periodStart: string; periodEnd: string }) {
  const [row] = await db.sequelize.query<{ total: string | null }>(
    `SELECT SUM(le.volume_ml) AS total FROM ledger_entries le JOIN projects p ON p.id = le.project_id
      WHERE p.client_id = :clientId AND le.reagent_id = :reagentId AND le.kind <> 'preparation'
        AND le.occurred_at >= :start AND le.occurred_at < DATE_ADD(:end, INTERVAL 1 DAY)`,
    { type: QueryTypes.SELECT, replacements: { clientId, reagentId, start: range.periodStart, end: range.periodEnd } },
  );
  return Number(row?.total ?? 0);
}

describe("statements from the ledger", () => {
  it("lines carry the ledger's volumes for the period, costed at the external rates", async () => {
    const computed = await computeStatement(QUILLFEATHER, period.periodStart, period.periodEnd);
    expect(computed.lines.length).toBeGreaterThan(0);
    const acetonitrile = computed.lines.filter((l) => l.reagentId === "acetonitrile").reduce((s, l) => s + Number(l.quantity), 0);
    expect(acetonitrile).toBeCloseTo(await ledgerSum(QUILLFEATHER, "acetonitrile", period), 3);
    // The demo's external acetonitrile price is €79.00 per litre.
    for (const line of computed.lines.filter((l) => l.reagentId === "acetonitrile")) {
      expect(line.unitPrice_minor).toBe(7900);
      expect(line.amount_minor).toBe(Math.round((Number(line.quantity) / 1000) * 7900));
    }
    expect(computed.total_minor).toBe(computed.lines.reduce((s, l) => s + l.amount_minor, 0));
  });
});

describe("invoicing an external client through the SDK and the fake", () => {
  let statementId = 0;
  let invoiceId = 0;
  let providerInvoiceId = "";

  it("creates the customer, items and invoice, finalizes and sends it; the hosted page shows it", async () => {
    const { id } = await openStatement({ clientId: QUILLFEATHER, ...period }, manager);
    statementId = id;
    const draft = await getStatement(id, manager);
    expect(draft.status).toBe("draft");
    expect(draft.blocker).toBeNull();

    const { invoice, created } = await invoiceStatement(id, { expectedTotal_minor: draft.total_minor }, manager);
    expect(created).toBe(true);
    invoiceId = invoice.id;
    providerInvoiceId = invoice.providerInvoiceId!;
    expect(invoice.status).toBe("open");
    expect(invoice.providerInvoiceId).toMatch(/^in_/);
    expect(invoice.amount_minor).toBe(draft.total_minor);
    expect(invoice.hostedUrl).toBe(`${fakeBase()}/i/${invoice.providerInvoiceId}`);

    const client = (await Client.findByPk(QUILLFEATHER))!;
    expect(client.paymentsCustomerId).toMatch(/^cus_/);
    const remote = await payments().invoices.retrieve(invoice.providerInvoiceId!);
    expect(remote).toMatchObject({
      status: "open",
      collection_method: "send_invoice",
      customer: client.paymentsCustomerId,
      total: draft.total_minor,
      days_until_due: 30,
    });
    expect(remote.lines.data.length).toBe(draft.lines.filter((l) => l.amount_minor !== 0).length);
    const events = await fakeJson<{ data: { type: string }[] }>(`/_fake/events?invoice=${invoice.providerInvoiceId}`);
    expect(events.data.map((e) => e.type)).toEqual(["invoice.finalized", "invoice.sent"]);

    const page = await fetch(invoice.hostedUrl!);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain(remote.number!);

    const statement = await getStatement(id, manager);
    expect(statement.status).toBe("issued");
  });

  it("the same statement invoiced twice at once, and again later, is one invoice at the fake", async () => {
    // A fresh statement, invoiced by two concurrent requests (a double click).
    const { id } = await openStatement({ clientId: TARNBROOK, ...period }, manager);
    const results = await Promise.all([invoiceStatement(id, {}, manager), invoiceStatement(id, {}, manager)]);
    expect(results.map((r) => r.created).sort()).toEqual([false, true]);
    expect(results[0].invoice.providerInvoiceId).toBe(results[1].invoice.providerInvoiceId);
    const again = await invoiceStatement(id, {}, manager);
    expect(again.created).toBe(false);
    const customer = (await Client.findByPk(TARNBROOK))!.paymentsCustomerId!;
    const atFake = await payments().invoices.list({ customer, limit: 100 });
    expect(atFake.data.length).toBe(1);
  });

  it("a retry after a lost answer reaches the same provider objects (idempotency keys)", async () => {
    const before = await payments().invoices.list({ customer: (await Client.findByPk(QUILLFEATHER))!.paymentsCustomerId!, limit: 100 });
    // Pretend the run's answer was lost after the provider did its work: Decant forgets the result.
    await db.sequelize.query("UPDATE invoices SET status = 'draft', provider_invoice_id = NULL WHERE id = :id", {
      replacements: { id: invoiceId },
    });
    await db.sequelize.query("UPDATE statements SET status = 'draft' WHERE id = :id", { replacements: { id: statementId } });
    await db.sequelize.query("DELETE FROM period_locks WHERE statement_id = :id", { replacements: { id: statementId } });
    const retried = await invoiceStatement(statementId, {}, manager);
    expect(retried.invoice.providerInvoiceId).toBe(providerInvoiceId);
    const after = await payments().invoices.list({ customer: (await Client.findByPk(QUILLFEATHER))!.paymentsCustomerId!, limit: 100 });
    expect(after.data.map((i) => i.id)).toEqual(before.data.map((i) => i.id));
  });

  it("the SDK's errors come back in the usual shape", async () => {
    await expect(payments().invoices.retrieve("in_doesnotexist")).rejects.toMatchObject({
      type: "StripeInvalidRequestError",
      code: "resource_missing",
      statusCode: 404,
    });
    await expect(
      payments().invoices.create({ customer: "cus_nobody", collection_method: "send_invoice", days_until_due: 30 }),
    ).rejects.toMatchObject({ code: "resource_missing", param: "customer" });
    const key = `it-${Date.now()}`;
    const customer = await payments().customers.create({ name: "Idempotency probe" }, { idempotencyKey: key });
    expect((await payments().customers.create({ name: "Idempotency probe" }, { idempotencyKey: key })).id).toBe(customer.id);
    await expect(payments().customers.create({ name: "Something else" }, { idempotencyKey: key })).rejects.toBeInstanceOf(
      Stripe.errors.StripeIdempotencyError,
    );
    const wrongKey = createPaymentsClient({ ...getEnv(), PAYMENTS_SECRET_KEY: "sk_test_wrong" });
    await expect(wrongKey.customers.retrieve(customer.id)).rejects.toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
  });

  describe("webhooks", () => {
    async function signedEvent(type: string) {
      const events = await fakeJson<{ data: { id: string; type: string }[] }>(`/_fake/events?invoice=${providerInvoiceId}&type=${type}`);
      const event = events.data.at(-1)!;
      return fakeJson<{ payload: string; signature: string }>(`/_fake/events/${event.id}/payload`);
    }
    const status = async () => (await Invoice.findByPk(invoiceId))!.status;

    it("a forged or missing signature gets 400 and changes nothing", async () => {
      await fakeJson(`/_fake/invoices/${providerInvoiceId}/pay`, { method: "POST" });
      const { payload, signature } = await signedEvent("invoice.paid");
      const processed = await ProcessedEvent.count();
      const forged = signature.replace(/v1=([0-9a-f])/, (_m, c: string) => `v1=${c === "0" ? "1" : "0"}`);
      await expect(handlePaymentsWebhook(payload, forged)).rejects.toMatchObject({ status: 400 });
      await expect(handlePaymentsWebhook(payload, null)).rejects.toMatchObject({ status: 400 });
      await expect(handlePaymentsWebhook(payload.replace('"invoice.paid"', '"invoice.voided"'), signature)).rejects.toBeInstanceOf(
        HttpError,
      );
      expect(await ProcessedEvent.count()).toBe(processed);
      expect(await status()).toBe("open");
    });

    it("a signed invoice.paid marks the invoice paid; the same event replayed 10 times changes nothing more", async () => {
      const { payload, signature } = await signedEvent("invoice.paid");
      const first = await handlePaymentsWebhook(payload, signature);
      expect(first.outcome).toBe("applied");
      const invoice = (await Invoice.findByPk(invoiceId))!;
      expect(invoice.status).toBe("paid");
      expect(invoice.paidAt).toBeInstanceOf(Date);
      const audits = await AuditEntry.count({ where: { entity: "invoice", entityId: String(invoiceId) } });
      for (let i = 0; i < 10; i++) expect((await handlePaymentsWebhook(payload, signature)).outcome).toBe("duplicate");
      expect(await AuditEntry.count({ where: { entity: "invoice", entityId: String(invoiceId) } })).toBe(audits);
      expect((await Invoice.findByPk(invoiceId))!.updatedAt.getTime()).toBe(invoice.updatedAt.getTime());
    });

    it("an older event arriving late does not reopen a paid invoice", async () => {
      const { payload, signature } = await signedEvent("invoice.finalized");
      expect((await handlePaymentsWebhook(payload, signature)).outcome).toBe("ignored");
      expect(await status()).toBe("paid");
    });

    it("the app's route answers 400 naming the header for unsigned and forged requests", async () => {
      const anonymous = await httpClient();
      const unsigned = await anonymous.fetch("/api/webhooks/payments", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: "{}",
      });
      expect(unsigned.status).toBe(400);
      expect((await unsigned.json()).error).toMatch(/Stripe-Signature/);
      const forged = await anonymous.fetch("/api/webhooks/payments", {
        method: "POST",
        headers: { "content-type": "application/json", "stripe-signature": `t=${Math.floor(Date.now() / 1000)},v1=${"0".repeat(64)}` },
        body: '{"id":"evt_x","type":"invoice.paid"}',
      });
      expect(forged.status).toBe(400);
    });
  });

  it("a client contact sees their own organisation's statements and invoices only, never a draft", async () => {
    const statements = await listStatements(contact);
    expect(statements.length).toBeGreaterThan(0);
    expect(new Set(statements.map((s) => s.clientId))).toEqual(new Set([QUILLFEATHER]));
    const invoices = await listInvoices(contact);
    expect(invoices.every((i) => i.clientId === QUILLFEATHER)).toBe(true);
    const foreign = (await listStatements(manager)).find((s) => s.clientId === TARNBROOK)!;
    await expect(getStatement(foreign.id, contact)).rejects.toMatchObject({ status: 404 });
    const { id: draftId } = await openStatement({ clientId: QUILLFEATHER, ...earlier }, manager);
    await expect(getStatement(draftId, contact)).rejects.toMatchObject({ status: 404 });
  });
});

describe("internal chargeback and period locks", () => {
  let statementId = 0;

  it("issues an internal statement and exports the chargeback journal with its cost centre", async () => {
    const { id } = await openStatement({ clientId: PLANT_GROUP, ...period }, manager);
    statementId = id;
    const draft = await getStatement(id, manager);
    await expect(issueStatement(id, { expectedTotal_minor: draft.total_minor + 1 }, manager)).rejects.toMatchObject({ status: 409 });
    await issueStatement(id, { expectedTotal_minor: draft.total_minor }, manager);
    const journal = await chargebackJournal(period.periodStart, period.periodEnd);
    const rows = journal.text
      .trimEnd()
      .split("\r\n")
      .slice(1)
      .map((r) => r.split(","));
    const mine = rows.filter((r) => r[0] === "CC-4102");
    expect(mine.length).toBeGreaterThan(0);
    const cents = mine.reduce((s, r) => s + Math.round(Number(r[2]) * 100), 0);
    expect(cents).toBe(draft.total_minor);
    expect(rows.every((r) => r[0]!.startsWith("CC-"))).toBe(true); // external clients are never journalled
  });

  it("locks the period for that client only; a later correction falls into the next open period", async () => {
    const mid = new Date(`${period.periodStart.slice(0, 8)}15T10:00:00Z`);
    expect(await isPeriodLocked(PLANT_GROUP, mid)).toBe(true);
    expect(await isPeriodLocked(PLANT_GROUP, period.periodEnd)).toBe(true);
    expect(await isPeriodLocked(PLANT_GROUP, earlier.periodStart)).toBe(false);
    expect(await isPeriodLocked(2, mid)).toBe(false);
    const relocated = await openDateFor(PLANT_GROUP, mid);
    // The next open period starts at local midnight in the demo's Europe/Berlin.
    expect(relocated.toISOString()).toBe(
      startOfLocalDay(
        monthBounds(new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), 1)).toISOString().slice(0, 7)).periodStart,
        "Europe/Berlin",
      ).toISOString(),
    );
    expect((await openDateFor(2, mid)).getTime()).toBe(mid.getTime());

    // A correction of 100 mL of acetonitrile, dated where the lock sends it.
    const issued = await getStatement(statementId, manager);
    await db.sequelize.query(
      `INSERT INTO ledger_entries (occurred_at, project_id, kind, reagent_id, volume_ml, source_kind, reason, created_at)
       VALUES (:at, 1, 'correction', 'acetonitrile', -100, 'manual', 'late correction', NOW())`,
      { replacements: { at: relocated } },
    );
    expect((await getStatement(statementId, manager)).lines).toEqual(issued.lines);
    const openDay = localDay(relocated, "Europe/Berlin");
    const next = await computeStatement(PLANT_GROUP, openDay, openDay);
    expect(next.lines.find((l) => l.reagentId === "acetonitrile")?.quantity).toBe("-100");
  });

  it("a price change never changes an issued statement, and cannot reach back into an issued period", async () => {
    const before = await getStatement(statementId, manager);
    await addRate(
      {
        kind: "reagent",
        reagentId: "acetonitrile",
        priceList: "internal",
        unit: "L",
        amount_minor: 9_999,
        currency: "EUR",
        effectiveFrom: new Date().toISOString().slice(0, 10),
      },
      manager,
    );
    expect(await getStatement(statementId, manager)).toEqual(before);
    await expect(
      addRate(
        {
          kind: "reagent",
          reagentId: "acetonitrile",
          priceList: "internal",
          unit: "L",
          amount_minor: 1,
          currency: "EUR",
          effectiveFrom: period.periodStart,
        },
        manager,
      ),
    ).rejects.toThrow(/effectiveFrom/);
  });
});

describe("through the running app: invoice, pay on the hosted page, webhook marks it paid", () => {
  it("an external client's invoice is paid at the fake and Decant shows it paid", async () => {
    const manager = await httpClient("manager@demo.test");
    const opened = await manager.fetch("/api/statements", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ clientId: TARNBROOK, ...earlier }),
    });
    expect([200, 201]).toContain(opened.status);
    const { id } = (await opened.json()) as { id: number };
    const draft = (await (await manager.fetch(`/api/statements/${id}`)).json()) as { total_minor: number };
    // Two clicks at once: one invoice.
    const send = () =>
      manager.fetch(`/api/statements/${id}/invoice`, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ expectedTotal_minor: draft.total_minor }),
      });
    const answers = await Promise.all([send(), send()]);
    expect(answers.map((a) => a.status).sort()).toEqual([200, 201]);
    const { invoice } = (await answers[0]!.json()) as { invoice: { providerInvoiceId: string; hostedUrl: string; status: string } };
    expect(invoice.status).toBe("open");
    const atFake = await fakeJson<{ data: unknown[] }>(
      `/_fake/invoices?metadata[decant_statement_id]=${id}&metadata[decant_client_id]=${TARNBROOK}`,
    );
    expect(atFake.data.filter((i) => (i as { id: string }).id === invoice.providerInvoiceId).length).toBe(1);

    // The client pays on the hosted page (a form post, as the browser does).
    const paid = await fetch(`${invoice.hostedUrl}/pay`, { method: "POST", redirect: "manual" });
    expect(paid.status).toBe(303);
    let status = "";
    for (let i = 0; i < 50 && status !== "paid"; i++) {
      await new Promise((r) => setTimeout(r, 200));
      status = ((await (await manager.fetch(`/api/statements/${id}`)).json()) as { invoice: { status: string } }).invoice.status;
    }
    expect(status).toBe("paid");
    // The fake delivered each event once and Decant accepted it.
    const events = await fakeJson<{ data: { type: string; delivery: { delivered: boolean; last_status: number } }[] }>(
      `/_fake/events?invoice=${invoice.providerInvoiceId}`,
    );
    expect(events.data.map((e) => e.type)).toEqual(["invoice.finalized", "invoice.sent", "invoice.payment_succeeded", "invoice.paid"]);
    expect(events.data.every((e) => e.delivery.delivered && e.delivery.last_status === 200)).toBe(true);
  });
});

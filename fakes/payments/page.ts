// The hosted invoice page the fake serves at /i/<invoice id>: what a client sees when following
// the payment link. Plain HTML with two forms: settle the invoice, or simulate a declined payment.

interface Line {
  description: string | null;
  amount: number;
  quantity: number;
}
interface InvoiceView {
  id: string;
  number: string | null;
  status: string;
  currency: string;
  total: number;
  amount_due: number;
  amount_remaining: number;
  due_date: number | null;
  last_payment_error: string | null;
  lines: { data: Line[] };
}

const escape = (s: string) => s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);

function money(minor: number, currency: string) {
  const code = currency.toUpperCase();
  const digits = new Intl.NumberFormat("en", { style: "currency", currency: code }).resolvedOptions().maximumFractionDigits ?? 2;
  return new Intl.NumberFormat("en-GB", {
    style: "currency",
    currency: code,
    minimumFractionDigits: digits,
    maximumFractionDigits: digits,
  }).format(minor / 10 ** digits);
}

export function hostedInvoicePage(
  invoice: InvoiceView,
  customer: { name: string | null; email: string | null },
  note: string | null,
): string {
  const payable = invoice.status === "open" || invoice.status === "uncollectible";
  const rows = invoice.lines.data
    .map((line) => `<tr><td>${escape(line.description ?? "")}</td><td class="n">${escape(money(line.amount, invoice.currency))}</td></tr>`)
    .join("");
  const due = invoice.due_date ? new Date(invoice.due_date * 1000).toISOString().slice(0, 10) : "on receipt";
  const message =
    note === "paid"
      ? `<p class="msg ok" role="status">Payment received. Thank you.</p>`
      : note === "failed"
        ? `<p class="msg bad" role="alert">The payment was declined. Nothing was charged.</p>`
        : note
          ? `<p class="msg bad" role="alert">${escape(note)}</p>`
          : "";
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>Invoice ${escape(invoice.number ?? invoice.id)}</title>
<style>
  body { font: 16px/1.5 system-ui, sans-serif; margin: 0; background: #eef1f4; color: #1d242b; }
  main { max-width: 34rem; margin: 3rem auto; background: #fff; padding: 2rem; border-radius: 10px; box-shadow: 0 1px 3px #0002; }
  .banner { font-size: .8rem; letter-spacing: .05em; text-transform: uppercase; color: #6b7580; }
  h1 { margin: .2rem 0 1rem; font-size: 1.4rem; }
  table { width: 100%; border-collapse: collapse; margin: 1rem 0; }
  td { padding: .4rem 0; border-bottom: 1px solid #e3e6ea; } .n { text-align: right; font-variant-numeric: tabular-nums; }
  .total td { font-weight: 600; border-bottom: 0; }
  .status { display: inline-block; padding: .1rem .6rem; border-radius: 1rem; background: #e3e6ea; font-size: .85rem; }
  .msg { padding: .6rem .8rem; border-radius: 6px; } .ok { background: #e2f3e6; } .bad { background: #f8e1de; }
  form { display: inline; } button { font: inherit; padding: .6rem 1.2rem; border-radius: 6px; border: 1px solid #3a4a5a; cursor: pointer; }
  .pay { background: #23405c; color: #fff; } .fail { background: #fff; color: #23405c; margin-left: .5rem; }
</style></head>
<body><main>
  <p class="banner">Test payments service · nothing here moves real money</p>
  <h1>Invoice ${escape(invoice.number ?? invoice.id)}</h1>
  <p>Billed to ${escape(customer.name ?? customer.email ?? "customer")}<br>Due ${escape(due)} · <span class="status" data-testid="invoice-status">${escape(invoice.status)}</span></p>
  ${message}
  <table><tbody>${rows}<tr class="total"><td>Amount due</td><td class="n" data-testid="amount-due">${escape(money(invoice.amount_remaining, invoice.currency))}</td></tr></tbody></table>
  ${invoice.last_payment_error && invoice.status === "open" ? `<p class="msg bad">Last attempt: ${escape(invoice.last_payment_error)}</p>` : ""}
  ${
    payable
      ? `<form method="post" action="/i/${invoice.id}/pay"><button class="pay" type="submit">Pay ${escape(money(invoice.amount_remaining, invoice.currency))}</button></form>
  <form method="post" action="/i/${invoice.id}/fail"><button class="fail" type="submit">Simulate a declined payment</button></form>`
      : ""
  }
</main></body></html>`;
}

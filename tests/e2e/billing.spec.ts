// The manager's journey "invoice an external client": open last month's draft, review it, send
// the invoice; the client's e-mail arrives with the PDF; the client pays on the payments fake's
// hosted page; the fake's signed webhook marks the invoice paid in Decant. Then the client portal.
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { expect, test } from "@playwright/test";
import { mailboxDir, waitForMail } from "../support/mailbox";
import { signIn } from "./support";

const now = new Date();
const lastMonth = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 1, 1)).toISOString().slice(0, 7);

test("the manager invoices an external client and sees it paid", async ({ page }) => {
  test.setTimeout(90_000);
  const since = new Date();
  await signIn(page, "manager@demo.test");
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Statements" }).click();
  await expect(page).toHaveURL(/\/statements$/);
  await expect(page.getByRole("heading", { name: "Statements" })).toBeVisible();
  await expect(page.locator("#month")).toHaveValue(lastMonth);

  const row = page.getByRole("row", { name: /Quillfeather Therapeutics/ });
  await expect(row.getByText("not opened")).toBeVisible();
  await row.getByRole("button", { name: "Open the draft for Quillfeather Therapeutics" }).click();

  // Review: the draft's lines per project, at the external rates.
  await expect(page).toHaveURL(/\/statements\/\d+$/);
  await expect(page.getByRole("heading", { name: "Quillfeather Therapeutics" })).toBeVisible();
  await expect(page.getByTestId("statement-status")).toHaveText("draft");
  const lines = page.getByTestId("statement-lines");
  await expect(lines.getByText("QFT-IMP-014").or(lines.getByText("QFT-STB-015")).first()).toBeVisible();
  await expect(lines.getByRole("row", { name: /Acetonitrile/ }).first()).toContainText("€79.00 / L");
  const total = (await page.getByTestId("statement-total").textContent())!.trim();
  expect(total).toMatch(/^€[\d,]+\.\d\d$/);
  expect(total).not.toBe("€0.00");

  await page.getByRole("button", { name: "Issue and send invoice" }).click();
  await expect(page.getByText(`Send an invoice for ${total} to accounts@quillfeather.test?`)).toBeVisible();
  await page.getByRole("button", { name: "Send invoice" }).click();

  // Sent: issued, the invoice open at the payments service (several provider round trips: on a
  // busy machine this takes longer than a click's usual wait).
  await expect(page.getByTestId("statement-status")).toHaveText("issued", { timeout: 30_000 });
  await expect(page.getByTestId("invoice-status")).toHaveText("open: awaiting payment");
  const panel = page.getByTestId("invoice-panel");
  await expect(panel).toContainText(total);
  const hosted = await panel.getByRole("link", { name: "Client's payment page" }).getAttribute("href");
  expect(hosted).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/i\/in_/);

  // The client's e-mail, with the statement PDF and the link to pay.
  const mail = await waitForMail("accounts@quillfeather.test", { since, subject: /Invoice .* from .*€/ });
  expect(mail.text).toContain(hosted!);
  // The fake keeps the raw message beside the parsed one: the PDF is attached.
  const raw = (JSON.parse(readFileSync(join(mailboxDir(), `${mail.id}.json`), "utf8")) as { raw: string }).raw;
  expect(raw).toMatch(/Content-Type: application\/pdf; name=ST-\d+\.pdf/i);
  expect(raw).toMatch(/Content-Disposition: attachment; filename=ST-\d+\.pdf/i);

  // The client pays on the hosted page.
  const statementUrl = page.url();
  await page.goto(hosted!);
  await expect(page.getByTestId("invoice-status")).toHaveText("open");
  await page.getByRole("button", { name: `Pay ${total}` }).click();
  await expect(page.getByText("Payment received. Thank you.")).toBeVisible();
  await expect(page.getByTestId("invoice-status")).toHaveText("paid");

  // The webhook reaches Decant: the invoice shows paid.
  await page.goto(statementUrl);
  await expect(async () => {
    await page.reload();
    await expect(page.getByTestId("invoice-status")).toHaveText("paid", { timeout: 1000 });
  }).toPass({ timeout: 20_000 });
  await page.goto(`/statements?month=${lastMonth}`);
  await expect(page.getByRole("row", { name: /Quillfeather Therapeutics/ })).toContainText("paid");
});

test("the client contact sees their own organisation's invoices and statement PDF only", async ({ page }) => {
  await signIn(page, "client@demo.test");
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Invoices" }).click();
  const table = page.getByTestId("invoice-table");
  await expect(table.getByRole("row")).not.toHaveCount(1);
  await expect(table).not.toContainText("Tarnbrook");
  await expect(table.getByText("paid").first()).toBeVisible();
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Statements" }).click();
  const pdfLink = page.getByRole("link", { name: "PDF" }).first();
  const response = await page.request.get((await pdfLink.getAttribute("href"))!);
  expect(response.status()).toBe(200);
  expect(response.headers()["content-type"]).toBe("application/pdf");
  expect((await response.body()).subarray(0, 5).toString()).toBe("%PDF-");
});

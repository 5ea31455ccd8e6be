// The overview opens with the few figures each role checks first (issue 15), linking to where the work is.
import { expect, test, type Page } from "@playwright/test";
import { signIn } from "./support";

const shots = `${process.env.DECANT_TEST_DATA_DIR ?? ".data/test"}/playwright-output`;
const figure = (page: Page, label: string) => page.getByTestId("key-figures").locator(`[data-figure="${label}"]`);

test("a technician sees the bottles expiring within a day and the batches to make", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  const expiring = figure(page, "Bottles expiring within 24 h");
  await expect(expiring).toBeVisible();
  // Each batch in the "Due today" list has at least one bottle still on the bench.
  const dueBatches = await page.getByTestId("due-today").locator("li").count();
  expect(Number(await expiring.locator("[data-value]").innerText())).toBeGreaterThanOrEqual(dueBatches);
  await expect(figure(page, "Batches to make")).toHaveAttribute("href", "/batches/new");
  await page.screenshot({ path: `${shots}/overview-technician.png`, fullPage: true });
});

test("a manager sees this month's use, what is not billed yet and overdue invoices", async ({ page }) => {
  await signIn(page, "manager@demo.test");
  await expect(figure(page, "Not yet billed this month").locator("[data-value]")).toContainText("€");
  await expect(figure(page, "Overdue invoices")).toHaveAttribute("href", "/invoices");
  await expect(page.getByTestId("key-figures").locator("[data-figure^='Used since']")).toContainText(/\d/);
  await page.setViewportSize({ width: 390, height: 844 });
  await page.screenshot({ path: `${shots}/overview-manager-390.png`, fullPage: true });
});

test("a safety officer sees the containers near full or their time limit, and the flammables by room", async ({ page }) => {
  await signIn(page, "safety@demo.test");
  // The demo's halogenated carboy under Heron was read near full; the acid carboy has accumulated for 170 of 180 days.
  const containers = figure(page, "Containers near full or their time limit");
  await expect(containers).toContainText("WC-0103");
  await expect(containers).toContainText("WC-0105");
  await expect(figure(page, "Rooms near or over their flammables limit")).toContainText("B2.14:");
  await page.screenshot({ path: `${shots}/overview-safety.png`, fullPage: true });
});

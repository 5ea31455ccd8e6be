// Issue 21, a batch record a technician can trust: one browser test per defect, each failing on the
// behaviour before the fix (the assertion that failed is named in the comment above it).
import { expect, test, type Page } from "@playwright/test";
import { signIn } from "./support";

const ACN = "MP-FA-ACN · 0.1 % formic acid in acetonitrile (v1, ch. B)";
const PHOS = "MP-PHOS-30 · 25 mM potassium phosphate, pH 3.0 (v1, ch. A)";

async function openForm(page: Page, recipe?: string) {
  await signIn(page, "tech@demo.test");
  await page.goto("/batches/new");
  if (recipe) await page.getByLabel("Recipe", { exact: true }).selectOption({ label: recipe });
}

async function pickLot(page: Page, label: string, lot: string) {
  const select = page.getByLabel(label);
  const value = await select.locator("option", { hasText: lot }).first().getAttribute("value");
  await select.selectOption(value!);
}

test("1 · the label and the batch page give one expiry, from the rule that computed it", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  await page.goto("/batches/6"); // the demo's phosphate buffer, made yesterday
  const basis = page.getByTestId("expiry-basis");
  await expect(basis).toHaveText("aqueous buffer without organic, 2 days");
  // Before: the storage line said "2–8 °C, use within 7 days" beside a 48 h expiry.
  await expect(page.getByTestId("batch-storage")).toHaveText("2–8 °C · shelf life: aqueous buffer without organic, 2 days");
  await expect(page.getByText(/use within 7 days/)).toHaveCount(0);
  await expect(page.getByText("Storage: 2–8 °C · shelf life: aqueous buffer without organic, 2 days")).toBeVisible();
});

test("2 · discarding a bottle asks first, in numbers, and can be undone by a reversing entry", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  await page.goto("/batches/4");
  const discard = page.getByRole("button", { name: /^Discard bottle \d+$/ }).first();
  const name = (await discard.getAttribute("aria-label"))!;
  const number = name.replace("Discard bottle ", "");
  await discard.click();
  // Before: the click sent the bottle to the waste ledger at once; there was no dialog.
  const dialog = page.getByRole("dialog", { name: new RegExp(`^Discard bottle ${number} of B\\d{2}-\\d{4}`) });
  await expect(dialog).toBeVisible();
  await dialog.getByLabel(`mL left in bottle ${number}`).fill("250");
  await expect(dialog.getByTestId("confirm-consequences")).toContainText('250.0 mL go to waste as "discard" entries in the ledger');
  await dialog.getByRole("button", { name: "Cancel" }).click();
  await expect(dialog).toBeHidden();
  // The State cell of that bottle's row (the row also holds the closed dialogs' text).
  const state = page
    .getByRole("row")
    .filter({ hasText: `${number} of` })
    .getByRole("cell")
    .nth(1);
  await expect(state).not.toContainText("discarded");

  await discard.click();
  await dialog.getByRole("button", { name: "Discard 250.0 mL" }).click();
  await expect(state).toContainText("discarded");
  const undo = page.getByTestId("undo-notice");
  await expect(undo).toContainText(`Bottle ${number} discarded: 250.0 mL to waste.`);
  await undo.getByRole("button", { name: "Undo" }).click();
  await expect(page.getByTestId("undone")).toContainText("reversing entry");
  await expect(state).not.toContainText("discarded");
});

// Known defect, found in the merged build: after a refused submit the "As planned" button of the
// refused row never becomes actionable (Playwright: not stable), so the row cannot be put right
// with it. Open until the cause is found; the refusal itself is tested in batch-record.test.ts.
test.fixme("3 · actuals start empty, are required, and 'As planned' copies the target visibly", async ({ page }) => {
  await openForm(page, ACN);
  const actual = page.getByLabel("Actual amount of Formic acid (mL)");
  // Before: the field showed the target as a grey placeholder, so it looked filled in.
  await expect(actual).toHaveValue("");
  await expect(actual).not.toHaveAttribute("placeholder");
  await pickLot(page, "Lot of Acetonitrile", "AN-58213");
  await pickLot(page, "Lot of Formic acid", "FA-2290");
  await page.getByRole("button", { name: "Acetonitrile: as planned" }).click();
  await expect(page.getByLabel("Actual amount of Acetonitrile (mL)")).toHaveValue("999.0");
  await page.getByRole("button", { name: "Record the batch" }).click();
  await expect(page.getByText('Record the formic acid actually used, or press "As planned"')).toBeVisible();
  await expect(page).toHaveURL(/\/batches\/new$/);
  await actual.fill("10");
  await page.getByRole("button", { name: "Record the batch" }).click();
  await expect(page.getByText(/10\.0 mL is 10× the target 1\.00 mL: check the unit and the decimal point/)).toBeVisible();
  await page.getByRole("button", { name: "Formic acid: as planned" }).click();
  await expect(actual).toHaveValue("1.000");
  await page.getByRole("button", { name: "Record the batch" }).click();
  await expect(page).toHaveURL(/\/batches\/\d+\?recorded=1$/);
  // Item 6: done is not shown in the warning colour.
  await expect(page.getByText("Batch recorded.")).toHaveClass(/notice-ok/);
});

test("4 · the acid added to reach the pH is the titrant, compared with its estimate, not a deviation", async ({ page }) => {
  await openForm(page, PHOS);
  const row = page.getByTestId("amounts").getByRole("row").filter({ hasText: "Phosphoric acid" });
  // Before: it was tagged "to pH" and held to ±2 %.
  await expect(row).toContainText("titrant");
  await page.getByLabel("Actual amount of Phosphoric acid 85 % (mL)").fill("0.40");
  await page.getByLabel(/^Measured pH/).fill("3.01");
  await expect(page.getByText("Outside the facility's tolerances")).toHaveCount(0);
});

test("5 · the order of work fits the mix: no water in a neat acetonitrile recipe, 1000 mL is 1000 mL", async ({ page }) => {
  await openForm(page, ACN);
  const steps = page.getByTestId("order-of-work");
  await expect(steps).toContainText("of formic acid to the acetonitrile");
  // Before: "add formic acid to the water, never water to the acid", and a final volume of 1001 mL.
  await expect(steps).not.toContainText(/water/i);
  await expect(page.getByTestId("final-volume")).toHaveText("1000 mL");
});

test("6 · the form preselects no recipe, and the bottle size follows the number of bottles", async ({ page }) => {
  await openForm(page);
  // Before: the first recipe was preselected.
  await expect(page.getByLabel("Recipe", { exact: true })).toHaveValue("0");
  await page.getByLabel("Recipe", { exact: true }).selectOption({ label: ACN });
  await page.getByLabel("Batch volume", { exact: true }).fill("4000");
  await page.getByLabel("Bottles", { exact: true }).fill("2");
  await expect(page.getByLabel("Bottle size (mL)")).toHaveValue("2000");
  await expect(page.getByRole("heading", { name: "Warnings about this mix" }).or(page.getByText("Cautions for making it"))).not.toHaveCount(
    0,
  );
});

test("8 · a demo batch has its bottles, and its code is its preparation day", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  await page.goto("/batches/6");
  const code = (await page.getByRole("heading", { level: 1 }).innerText()).trim();
  const { batch } = (await (await page.request.get("/api/batches/6")).json()) as { batch: { preparedAt: string } };
  const prepared = batch.preparedAt.slice(0, 10); // codes are UTC days, as batchCodeBase makes them
  // Before: B26-1120 was made two days before the demo was loaded, whatever that day was.
  expect(code).toBe(`B${prepared.slice(2, 4)}-${prepared.slice(5, 7)}${prepared.slice(8, 10)}`);
  await expect(page.getByRole("row").filter({ hasText: "1 of 1" })).toBeVisible();
  // Before: the preview frame sat dark and empty while the PDF loaded; now a loading line until it is there.
  await expect(page.locator(".label-preview")).toHaveAttribute("data-state", "ready");
  await expect(page.getByTestId("label-preview-loading")).toBeHidden();
});

import { mkdirSync } from "node:fs";
import { expect, test, type Page } from "@playwright/test";
import { signIn } from "./support";

// Screenshots for a person to look at (not compared): the folder Playwright writes its output to.
const SHOTS = `${process.env.DECANT_TEST_DATA_DIR ?? ".data/test"}/playwright-output/screens`;
async function shoot(page: Page, name: string) {
  mkdirSync(SHOTS, { recursive: true });
  for (const width of [1366, 390]) {
    await page.setViewportSize({ width, height: 900 });
    await page.screenshot({ path: `${SHOTS}/${name}-${width}.png`, fullPage: true });
  }
  await page.setViewportSize({ width: 1366, height: 900 });
}

test("a technician records a lot with the assay from its certificate, and the stock list shows it", async ({ page }) => {
  const lot = `KOH-E2E-${Date.now().toString(36).toUpperCase()}`;
  await signIn(page, "tech@demo.test");
  await page.goto("/stock-lots");
  await page.getByText("Record a lot received").click();
  await page.getByLabel("Reagent").selectOption({ label: "Potassium hydroxide" });
  await expect(page.getByText(/the typical 85 % is used and batches say so/)).toBeVisible();
  // A solid: no density to record.
  await expect(page.getByLabel(/Density at 20 °C/)).toHaveCount(0);
  await page.getByLabel("Lot number").fill(lot);
  await page.getByLabel("Grade").fill("analytical");
  await page.getByLabel("Supplier").fill("Example Supplies");
  await page.getByLabel(/Quantity/).fill("500");
  await page.getByLabel("Expires").fill("2099-01-31");
  await page.getByLabel("Assay (% w/w, from the certificate)").fill("120");
  await page.getByRole("button", { name: "Record the lot" }).click();
  await expect(page.getByText("Assay: at most 100 %")).toBeVisible();
  await page.getByLabel("Assay (% w/w, from the certificate)").fill("85.4");
  await page.getByRole("button", { name: "Record the lot" }).click();
  await expect(page).toHaveURL(/\/stock-lots\?added=1$/);
  const row = page.getByRole("row", { name: new RegExp(lot) });
  await expect(row).toContainText("85.4 %");
  await shoot(page, "stock-lots");
});

test("the picked lot's assay sets what is weighed, the form and the batch say which, and the batch shows its pH", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  // A lot of the salt whose certificate gives no assay.
  const plain = `KP-E2E-${Date.now().toString(36).toUpperCase()}`;
  const created = await page.request.post("/api/stock-lots", {
    multipart: {
      reagent: "potassium-dihydrogen-phosphate",
      lotNumber: plain,
      supplier: "Example Supplies",
      grade: "analytical",
      receivedOn: "2026-01-05",
      expiresOn: "2099-01-05",
      quantity: "500",
    },
  });
  expect(created.status()).toBe(201);
  await page.goto("/batches/new");
  await page.getByLabel("Recipe", { exact: true }).selectOption({ label: "MP-PHOS-30 · 25 mM potassium phosphate, pH 3.0 (v1, ch. A)" });
  const pickLot = async (label: string, lot: string) => {
    const select = page.getByLabel(label);
    const value = await select.locator("option", { hasText: lot }).first().getAttribute("value");
    await select.selectOption(value!);
  };
  await pickLot("Lot of Water", "UPW-SYSTEM");
  await pickLot("Lot of Potassium dihydrogen phosphate", plain);
  const salt = page.getByTestId("target-potassium-dihydrogen-phosphate");
  await expect(page.getByTestId("assay-potassium-dihydrogen-phosphate")).toHaveText("no assay recorded: taken as 100 %");
  // 25 mM KH2PO4 in 1 L: 3.402 g (M = 136.084 g/mol, hand calculation)
  await expect(salt).toHaveText("3.402 g");
  await pickLot("Lot of Potassium dihydrogen phosphate", "KP-8120");
  await expect(page.getByTestId("assay-potassium-dihydrogen-phosphate")).toHaveText("assay 99.6 % (lot's certificate)");
  // 3.402 g / 0.996 = 3.416 g
  await expect(salt).toHaveText("3.416 g");
  await pickLot("Lot of Phosphoric acid 85 %", "PA-5120");
  await expect(page.getByTestId("assay-phosphoric-acid")).toHaveText("assay 85.6 % (lot's certificate)");
  await page.getByLabel(/Measured pH/).fill("3.0");
  await shoot(page, "prepare-with-assays");
  await page.getByRole("button", { name: "Record the batch" }).click();
  await expect(page).toHaveURL(/\/batches\/\d+\?recorded=1$/);
  await expect(page.getByTestId("assay-potassium-dihydrogen-phosphate")).toHaveText("assay 99.6 % (lot's certificate)");
  await expect(page.getByTestId("assay-phosphoric-acid")).toHaveText("assay 85.6 % (lot's certificate)");
  const ph = page.getByTestId("mobile-phase-ph");
  await expect(ph.getByTestId("ww-ph")).toHaveText(/^\s*3\.00\s*· measured 3\.00\s*$/);
  await expect(ph).toContainText("No organic solvent in this mobile phase");
  await ph.getByText("What these figures cover").click();
  await expect(ph.getByTestId("ph-model-limits")).toContainText("Bates–Guggenheim");
  await shoot(page, "batch-with-assays");
});

test("a recipe with acetonitrile shows the pH the column sees beside the aqueous pH, with the model's limits", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  const response = await page.request.post("/api/recipes", {
    data: {
      name: `Ammonium formate pH 3.5 with 30 % acetonitrile ${Date.now().toString(36)}`,
      channel: "A",
      spec: {
        solvents: [
          { reagent: "water", percent: 70 },
          { reagent: "acetonitrile", percent: 30 },
        ],
        buffer: { reagents: ["ammonium-formate", "formic-acid"], targetPH: 3.5, concentration_mM: 10, basis: "first", temperature_C: 25 },
      },
    },
  });
  expect(response.status()).toBe(201);
  const { recipe } = (await response.json()) as { recipe: { id: number } };
  await page.goto(`/recipes/${recipe.id}`);
  const ph = page.getByTestId("mobile-phase-ph");
  await expect(ph.getByTestId("ww-ph")).toHaveText(/^\s*3\.50\s*$/);
  await expect(ph).toContainText("Aqueous part as set, 25 °C");
  await expect(ph).toContainText("In the mix with 30 % acetonitrile");
  const ss = Number(await ph.getByTestId("ss-ph").innerText());
  const sw = Number(await ph.getByTestId("sw-ph").innerText());
  // Formic acid's pKa rises with acetonitrile, so the mix is less acidic than the water it was made from.
  expect(ss).toBeGreaterThan(3.6);
  expect(sw).toBeGreaterThan(3.6);
  await expect(ph).toContainText("pKa of formic acid in the mix");
  await ph.getByText("What these figures cover").click();
  await expect(ph.getByTestId("ph-model-limits")).toContainText("0–60 % acetonitrile or methanol");
  await shoot(page, "recipe-mobile-phase-ph");
});

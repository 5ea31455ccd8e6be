import { execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";
import { expect, test } from "@playwright/test";
import { signIn } from "./support";

test("a technician prepares a batch from a demo recipe, records it and prints its labels", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Batches" }).click();
  await page.getByRole("link", { name: "Prepare a batch" }).click();
  await expect(page.getByRole("heading", { name: "Prepare a batch" })).toBeVisible();

  await page.getByLabel("Recipe", { exact: true }).selectOption({ label: "MP-FA-W · 0.1 % formic acid in water (v1, ch. A)" });
  const faTarget = page.getByTestId("target-formic-acid");
  // 0.1 % of the final volume, the acid's own volume included: 1.001 mL for 1000 mL of water.
  await expect(faTarget).toHaveText("1.001 mL");

  // The amounts follow the volume as it is typed, computed in the browser.
  const volume = page.getByLabel("Batch volume", { exact: true });
  await volume.fill("");
  await volume.pressSequentially("2500");
  await expect(faTarget).toHaveText("2.503 mL");
  await expect(page.getByTestId("target-water")).toHaveText("2500 mL");
  await page.getByLabel("Unit for liquids").selectOption("l");
  await expect(page.getByTestId("target-water")).toHaveText("2.500 L");
  await page.getByLabel("Unit for liquids").selectOption("ml");

  await page.getByLabel("Bottles", { exact: true }).fill("3");
  await page.getByLabel("Bottle size (mL)").fill("1000");
  // Kept in room: the first known room by default; this batch stands in the other lab.
  await expect(page.getByLabel("Kept in room")).toHaveValue("B2.14");
  await page.getByLabel("Kept in room").selectOption("B2.16");
  const pickLot = async (label: string, lot: string) => {
    const select = page.getByLabel(label);
    const value = await select.locator("option", { hasText: lot }).first().getAttribute("value");
    await select.selectOption(value!);
  };
  await pickLot("Lot of Water", "UPW-SYSTEM");
  await pickLot("Lot of Formic acid", "FA-2290");
  await page.getByLabel("Actual amount of Water (mL)").fill("2500");
  await page.getByLabel("Actual amount of Formic acid (mL)").fill("2.51");
  await expect(page.getByText("Outside the facility's tolerances")).toHaveCount(0);
  await expect(page.getByText(/Follow your laboratory's SOPs/).first()).toBeVisible();

  await page.getByRole("button", { name: "Record the batch" }).click();
  await expect(page).toHaveURL(/\/batches\/\d+\?recorded=1$/);
  await expect(page.getByText("Batch recorded.")).toBeVisible();
  const code = (await page.getByRole("heading", { level: 1 }).innerText()).trim();
  expect(code).toMatch(/^B\d{2}-\d{4}(-\d+)?$/);
  await expect(page.getByTestId("batch-room")).toHaveText("B2.16");
  // The page shows the facility's locale and zone (the demo's Europe/Berlin), the label ISO order and the zone.
  await expect(page.getByTestId("prepared-at")).toContainText(/\d{2} \w{3} \d{4}, \d{2}:\d{2} CES?T/);

  await page.getByLabel("Copies", { exact: true }).fill("3");
  const [download] = await Promise.all([page.waitForEvent("download"), page.getByTestId("download-labels").click()]);
  const file = await download.path();
  expect(readFileSync(file).subarray(0, 5).toString()).toBe("%PDF-");
  const text = execFileSync("pdftotext", [file, "-"], { encoding: "utf8" });
  expect(text.match(new RegExp(code, "g"))).toHaveLength(3);
  expect(text).toMatch(/Prepared \d{4}-\d{2}-\d{2} \d{2}:\d{2} CES?T/);
  expect(text).toMatch(/Expires \d{4}-\d{2}-\d{2} \d{2}:\d{2} CES?T/);
  expect(text).toContain("Rowan Ellery");
  expect(text).toContain("Bottle 3 of 3");

  // The code field opens the batch, as a scanner would type it.
  await page.goto("/batches");
  await page.getByLabel("Batch code").fill(code);
  await page.getByLabel("Batch code").press("Enter");
  await expect(page).toHaveURL(/\/batches\/\d+$/);
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(code);
});

test("a recipe picked while the page is still loading is not lost: the form waits until it can take it", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  // Hold the page's scripts back, as a slow link or a busy laptop would.
  await page.route(/\/_astro\/.*\.js$/, async (route) => {
    await new Promise((resolve) => setTimeout(resolve, 1500));
    await route.continue();
  });
  await page.goto("/batches/new", { waitUntil: "domcontentloaded" });
  const recipe = page.getByLabel("Recipe", { exact: true });
  // The server-rendered form is on screen but cannot yet take input.
  await expect(recipe).toBeDisabled();
  await expect(page.getByRole("button", { name: "Record the batch" })).toBeDisabled();

  // Picking waits for the form to be ready, and the choice reaches the amounts.
  await recipe.selectOption({ label: "MP-FA-W · 0.1 % formic acid in water (v1, ch. A)" });
  await expect(page.getByTestId("target-formic-acid")).toHaveText("1.001 mL");
});

test("a technician writes a recipe: the form checks it, says it in words and per litre, and saves it", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  await page.goto("/recipes/new");
  // The preview arrives with the chemistry, just after the form.
  const words = page.getByTestId("recipe-description");
  await expect(words).toHaveText("Water 100 %");

  // The checks (the API route's own schema) run when the form is first sent.
  await page.getByRole("button", { name: "Create the recipe" }).click();
  await expect(page.getByText("Give the recipe a name (3–160 characters)")).toBeVisible();

  await page.getByLabel("Name").fill("Water–acetonitrile 70:30 with formic acid");
  await page.getByLabel("%", { exact: true }).first().fill("70");
  await page.getByRole("button", { name: "Add a solvent" }).click();
  await page.getByLabel("Solvent 2").selectOption({ label: "Acetonitrile" });
  await page.getByLabel("%", { exact: true }).nth(1).fill("30");
  await page.getByRole("button", { name: "Add an additive" }).click();
  await expect(page.getByLabel("Additive 1")).toHaveValue("formic-acid");
  await expect(words).toHaveText("Water 70 % + Acetonitrile 30 % · formic acid 0.1 %v/v");
  const litre = page.getByTestId("recipe-litre");
  await expect(litre.getByRole("listitem").filter({ hasText: "Acetonitrile" })).toContainText("300.0 mL");
  await expect(litre.getByRole("listitem").filter({ hasText: "Water" })).toContainText("700.0 mL");

  await page.getByRole("button", { name: "Create the recipe" }).click();
  await expect(page).toHaveURL(/\/recipes\/\d+\?saved=1$/);
  await expect(page.getByRole("heading", { name: "Water–acetonitrile 70:30 with formic acid" })).toBeVisible();
});

test("the recipe form still saves, checked by the server, when its checks and preview cannot be loaded", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  // The resolver, the recipe schema and (through it) the preview are fetched on demand: refuse them.
  await page.route(/\/_astro\/(zod|recipes|RecipePreview)\.[^/]+\.js$/, (route) => route.abort());
  await page.goto("/recipes/new");
  await expect(page.getByText("The preview could not be loaded; the recipe can still be saved.")).toBeVisible();

  // Sent unchecked, the API route's own schema names the field.
  await page.getByRole("button", { name: "Create the recipe" }).click();
  await expect(page.getByRole("alert")).toContainText("Give the recipe a name (3–160 characters)");

  await page.getByLabel("Name").fill("Plain water for rinsing");
  await page.getByRole("button", { name: "Create the recipe" }).click();
  await expect(page).toHaveURL(/\/recipes\/\d+\?saved=1$/);
});

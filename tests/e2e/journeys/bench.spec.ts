import { expect, test, type Page } from "@playwright/test";
import { signIn } from "../support";

/**
 * The technician's day and the safety officer's reading, run at desktop, tablet (820×1180) and phone
 * (390×844) sizes (playwright.config.ts). On every page: nothing wider than the screen, and the
 * controls the journey presses at least 44 px high (the usual minimum touch target).
 */

/** Opens a section the way a person on this screen would: the bottom bar, else the menu, else the sidebar. */
async function openSection(page: Page, label: string) {
  const quick = page.getByRole("navigation", { name: "Quick" }).getByRole("link", { name: label, exact: true });
  if (await quick.isVisible()) return quick.click();
  const menu = page.getByTestId("app-menu").locator("summary");
  if (await menu.isVisible()) await menu.click();
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: label, exact: true }).click();
}

async function expectFitsTheScreen(page: Page) {
  await page.waitForLoadState("load");
  const { overflow, culprits } = await page.evaluate(() => {
    const width = document.documentElement.clientWidth;
    // The innermost elements that reach past the right edge, to name in the failure.
    const past = [...document.body.querySelectorAll("*")].filter((el) => el.getBoundingClientRect().right > width + 1);
    const innermost = past.filter((el) => !past.some((other) => other !== el && el.contains(other)));
    return {
      overflow: document.documentElement.scrollWidth - width,
      culprits: innermost.slice(0, 5).map((el) => `${el.tagName.toLowerCase()}.${el.className}`),
    };
  });
  expect(overflow, `${page.url()} is wider than the screen: ${culprits.join(", ")}`).toBeLessThanOrEqual(0);
}

async function expectTouchTarget(page: Page, name: string) {
  if (test.info().project.name === "desktop") return; // a mouse needs no 44 px target
  const box = await page.getByRole("button", { name, exact: true }).boundingBox();
  expect(box?.height ?? 0, `"${name}" is a 44 px target`).toBeGreaterThanOrEqual(44);
}

test("a technician looks up a batch, prepares one, prints its labels, logs a run and a draw", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  await expectFitsTheScreen(page);

  // Look up: a typed code opens the batch and its bottles.
  await openSection(page, "Batches");
  await expectFitsTheScreen(page);
  await page.screenshot({
    path: `${process.env.DECANT_TEST_DATA_DIR ?? ".data/test"}/playwright-output/batches-${test.info().project.name}.png`,
  });
  await page.getByLabel("Batch code").fill("B26-1103");
  await expectTouchTarget(page, "Open");
  await page.getByRole("button", { name: "Open", exact: true }).click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("B26-1103");
  await expectFitsTheScreen(page);

  // Prepare.
  await page.goto("/batches/new");
  await page.getByLabel("Recipe", { exact: true }).selectOption({ label: "MP-FA-W · 0.1 % formic acid in water (v1, ch. A)" });
  await page.getByLabel("Bottles", { exact: true }).fill("1");
  await page.getByLabel("Bottle size (mL)").fill("1000");
  const lots: [string, string][] = [
    ["Lot of Water", "UPW-SYSTEM"],
    ["Lot of Formic acid", "FA-2290"],
  ];
  for (const [label, lot] of lots) {
    const select = page.getByLabel(label);
    await select.selectOption((await select.locator("option", { hasText: lot }).first().getAttribute("value"))!);
  }
  await page.getByLabel("Actual amount of Water (mL)").fill("1000");
  await page.getByLabel("Actual amount of Formic acid (mL)").fill("1.0");
  await expectFitsTheScreen(page);
  await expectTouchTarget(page, "Record the batch");
  await page.getByRole("button", { name: "Record the batch" }).click();
  await expect(page.getByText("Batch recorded.")).toBeVisible();
  await expectFitsTheScreen(page);

  // Label.
  const [download] = await Promise.all([page.waitForEvent("download"), page.getByTestId("download-labels").click()]);
  expect(download.suggestedFilename()).toMatch(/\.pdf$/);

  // Log a run.
  await openSection(page, "Runs & draws");
  await expectFitsTheScreen(page);
  await page.goto("/runs/new");
  await page.getByLabel("Instrument").selectOption({ label: "Wren" });
  await page.getByLabel("Method").selectOption({ label: "Scout gradient 5–95 % B, 12 min" });
  await page.getByLabel("Project").selectOption({ label: "PMG-ROOT-26 · Root exudate profiling" });
  await page.getByLabel("Injections").fill("2");
  await page.getByLabel("Extra blanks").fill("0");
  await page.getByLabel("Purge / prime per channel, mL").fill("0");
  const channelA = page.getByLabel(/^Channel A/);
  // The live demo batches of channels A and B (ids 4 and 5: their codes follow the day the demo was loaded).
  await channelA.selectOption({ value: "4" });
  const channelB = page.getByLabel(/^Channel B/);
  await channelB.selectOption({ value: "5" });
  await expectFitsTheScreen(page);
  await expectTouchTarget(page, "Record the run");
  await page.getByRole("button", { name: "Record the run" }).click();
  await expect(page.getByTestId("run-recorded")).toContainText("Run recorded");

  // A draw.
  await page.goto("/runs/draw");
  const batch = page.getByLabel("Batch", { exact: true });
  await batch.selectOption({ value: "4" });
  const drawnCode = /B\d{2}-\d{4}/.exec((await batch.locator('option[value="4"]').innerText()) ?? "")?.[0] ?? "";
  expect(drawnCode).not.toBe("");
  await page.getByLabel("Volume, mL").fill("2");
  await page.getByLabel("What for").selectOption("wash");
  await expectFitsTheScreen(page);
  await expectTouchTarget(page, "Record the draw");
  await page.getByRole("button", { name: "Record the draw" }).click();
  await expect(page.getByRole("status")).toContainText(`drawn from ${drawnCode}`);
});

test("the safety officer reads the waste overview and records a container's level", async ({ page }) => {
  await signIn(page, "safety@demo.test");
  await openSection(page, "Waste");
  await expect(page.getByRole("heading", { name: "Solvent waste" })).toBeVisible();
  await expectFitsTheScreen(page);
  await page.screenshot({
    path: `${process.env.DECANT_TEST_DATA_DIR ?? ".data/test"}/playwright-output/waste-${test.info().project.name}.png`,
  });
  // The near-full state is said in words, not only in colour.
  await expect(page.getByTestId("container-WC-0103").locator(".tag").first()).toContainText(/near full|over capacity/);

  await page.goto("/waste/containers");
  await expectFitsTheScreen(page);
  await page.getByRole("link", { name: "WC-0101" }).first().click();
  await expectFitsTheScreen(page);
  await page.getByLabel("Level read off the container (mL)").fill("1200");
  await expectTouchTarget(page, "Record reading");
  await page.getByRole("button", { name: "Record reading" }).click();
  await expect(page.getByRole("status").first()).toBeVisible();
});

import { expect, test, type Page } from "@playwright/test";
import { solventUse } from "../../src/lib/chem/solvent-use";
import { transferMethod } from "../../src/lib/chem/column-transfer";
import { substituteSolvent } from "../../src/lib/chem/substitution";
import type { ProgramPoint } from "../../src/lib/chem/solvent-use";
import { signIn } from "./support";

const shots = process.env.PLANNING_SCREENSHOTS;
async function shot(page: Page, name: string) {
  if (!shots) return;
  await page.screenshot({ path: `${shots}/${name}-1366.png`, fullPage: true });
  // The phone width in screen-high pieces, so that each can be read at its own size.
  await page.setViewportSize({ width: 390, height: 844 });
  const height = await page.evaluate(() => document.documentElement.scrollHeight);
  for (let y = 0, n = 1; y < height; y += 1200, n++)
    await page.screenshot({
      path: `${shots}/${name}-390-${n}.png`,
      fullPage: true,
      clip: { x: 0, y, width: 390, height: Math.min(1200, height - y) },
    });
  await page.setViewportSize({ width: 1366, height: 900 });
}

// The demo's impurity method (seeded): 10 → 60 % B over 25 min at 1 mL/min, wash, re-equilibration.
const impurity: ProgramPoint[] = [
  [0, 10],
  [25, 60],
  [27, 90],
  [27.5, 10],
  [33, 10],
].map(([time_min, b]) => ({ time_min: time_min!, flow_mL_min: 1, composition: { A: 100 - b!, B: b! } }));

test("a technician proposes a variant, reads its saving, saves it as a method version, and a manager approves it", async ({
  page,
  browser,
}) => {
  await signIn(page, "tech@demo.test");
  await page.goto("/methods");
  await page.getByRole("link", { name: "Impurity method 10–60 % B, 25 min" }).click();
  await page.getByRole("link", { name: /Plan ahead: another solvent/ }).click();
  await expect(page.getByRole("heading", { name: "Propose a variant" })).toBeVisible();
  await shot(page, "planning-method");

  // Methanol instead of acetonitrile, and the method moved from 150 × 4.6 mm, 5 µm to 100 × 2.1 mm, 1.8 µm.
  await page.getByLabel("New organic solvent").selectOption("methanol");
  await page.getByLabel("Move the method to another column").check();
  // Two isocratic scouting runs in acetonitrile (log kw 2.6, S 4, t0 1 min, as in what-if.spec.ts).
  await page.getByText(/Detection wavelength.*scouting runs/).click();
  await page.getByLabel("Dead time, min").fill("1");
  await page.getByLabel("Run 1: %B").fill("40");
  await page.getByLabel("Run 1: last peak, min").fill("11");
  await page.getByLabel("Run 2: %B").fill("50");
  await page.getByLabel("Run 2: last peak, min").fill("4.98107");
  await page.getByRole("button", { name: "Work it out" }).click();
  const preview = page.getByTestId("preview");
  await expect(preview.getByTestId("saving-total")).toBeVisible();
  await expect(preview.getByTestId("variant-warnings")).toContainText("changes selectivity");
  await expect(preview.getByTestId("variant-warnings")).toContainText("most viscous near 40–50 % methanol");
  await expect(preview.getByTestId("prediction")).toContainText("Last peak (LSS model from the scouting runs)");
  await shot(page, "planning-preview");

  // The saving is the difference of solventUse at the injections the ledger records (shown on screen).
  const injections = Number((await preview.getByTestId("saving").locator("strong").first().innerText()).replace(/,/g, ""));
  expect(injections).toBeGreaterThan(0);
  const variant = transferMethod({
    program: substituteSolvent({ program: impurity, from: "acetonitrile", to: "methanol" }).program,
    injection_uL: 10,
    from: { length_mm: 150, diameter_mm: 4.6, particle_um: 5, dwell_mL: 1 },
    to: { length_mm: 100, diameter_mm: 2.1, particle_um: 1.8, dwell_mL: 0.4 },
  }).program;
  const saved_L = (solventUse({ program: impurity, injections }).total_mL - solventUse({ program: variant, injections }).total_mL) / 1000;
  await expect(preview.getByTestId("saving-total")).toHaveText(`${saved_L >= 100 ? saved_L.toFixed(0) : saved_L.toFixed(2)} L`);
  await expect(preview.getByTestId("saving-money")).toContainText("€");

  await page.getByLabel("Name of the proposal (optional)").fill("Methanol on 100 × 2.1 mm");
  await page.getByRole("button", { name: "Keep as a proposal" }).click();
  await expect(page).toHaveURL(/kept=\d+/);
  const kept = page.getByTestId("variant").filter({ hasText: "Methanol on 100 × 2.1 mm" });
  await expect(kept.getByTestId("saving-total")).toHaveText(`${saved_L >= 100 ? saved_L.toFixed(0) : saved_L.toFixed(2)} L`);
  await expect(page.getByTestId("greenness").first()).toContainText("Methanol on 100 × 2.1 mm");

  await kept.getByRole("button", { name: "Save as a new method version" }).click();
  await expect(page).toHaveURL(/submitted=\d+/);
  const v2 = page.getByTestId("versions").locator('tr[data-version="2"]');
  await expect(v2).toContainText("waiting for approval");
  await expect(v2.getByRole("button", { name: /Approve/ })).toHaveCount(0); // nobody approves their own

  const managerContext = await browser.newContext();
  const manager = await managerContext.newPage();
  await signIn(manager, "manager@demo.test");
  await manager.goto(page.url().replace(/\?.*$/, ""));
  await manager.getByTestId("versions").locator('tr[data-version="2"]').getByRole("button", { name: "Approve version 2" }).click();
  await expect(manager).toHaveURL(/decided=\d+/);
  const approved = manager.getByTestId("versions").locator('tr[data-version="2"]');
  await expect(approved).toContainText("approved");
  await expect(approved).toContainText("current");
  await shot(manager, "planning-approved");
  await managerContext.close();

  // The method itself now runs the variant's program: the run time is the transferred one.
  await page.goto("/methods");
  const row = page.getByRole("row", { name: /Impurity method/ });
  await expect(row).toContainText(`${variant[variant.length - 1]!.time_min.toFixed(0)}`);
});

test("the facility view ranks methods by solvent and the supply page flags what to order", async ({ page }) => {
  await signIn(page, "manager@demo.test");
  // Other tests add stock to the shared demo, so the test sets the lead time itself: a year, far
  // longer than the acetonitrile on hand lasts at the ledger's daily use.
  const set = await page.request.put("/api/planning/supply", {
    data: { reagentId: "acetonitrile", leadTime_days: 365, safetyStock: 2000 },
  });
  expect(set.status()).toBe(200);
  await page.goto("/home");
  await expect(page.getByTestId("running-out")).toContainText("Acetonitrile");
  await shot(page, "planning-overview");
  await page.goto("/planning");
  const rows = page.getByTestId("facility-methods").locator("tbody tr");
  await expect(rows.first()).toBeVisible();
  await shot(page, "planning-facility");
  await page.goto("/planning/supply");
  // Acetonitrile on hand against months of daily runs, with the year's lead time set above.
  const acetonitrile = page.getByTestId("supply").locator('tr[data-reagent="acetonitrile"]');
  await expect(acetonitrile).toHaveAttribute("data-state", "runs-out");
  await expect(acetonitrile).toContainText("runs out within lead time");
  await shot(page, "planning-supply");
});

import { expect, test } from "@playwright/test";
import { signIn } from "./support";

test("a scientist enters two scouting runs on a method and sees the prediction and solvent follow the %B", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  await page.goto("/methods");
  await page.getByRole("link", { name: "Isocratic 40 % B" }).click();
  await expect(page.getByRole("heading", { name: "What if the eluent were weaker or stronger?" })).toBeVisible();
  await expect(page.getByTestId("what-if-caveat")).toContainText("must be verified");

  // Runs made from log kw 2.6, S 4, t0 1 min (worked by hand, as in tests/unit/ledger/what-if.test.ts).
  await page.getByLabel("Scouting run 1 %B").fill("40");
  await page.getByLabel("Scouting run 1 last peak, min").fill("11");
  await page.getByLabel("Scouting run 2 %B").fill("50");
  await page.getByLabel("Scouting run 2 last peak, min").fill("4.98107");
  await page.getByLabel("Dead time t0, min").fill("1");
  await page.getByLabel("Margin after the last peak, min").fill("3");
  await page.getByLabel("Predict at %B").fill("40");
  await expect(page.getByTestId("what-if-fit")).toContainText("S = 4.00");
  // 40 % B: last peak 11 min, run 14 min at 1 mL/min → 14 mL per injection, 1.4 L per 100.
  await expect(page.getByTestId("what-if-iso-retention")).toHaveText("11 min");
  await expect(page.getByTestId("what-if-iso-per100")).toContainText("1.4 L");

  // 30 % B: k = 10^1.4 = 25.12, last peak 26.12 min, run 29.12 min → 2.91 L per 100 (worked by hand).
  await page.getByLabel("Predict at %B").fill("30");
  await expect(page.getByTestId("what-if-iso-retention")).toHaveText("26.12 min");
  await expect(page.getByTestId("what-if-iso-runtime")).toHaveText("29.12 min");
  await expect(page.getByTestId("what-if-iso-per100")).toContainText("2.91 L");
  // Against the method now (8 min, 800 mL per 100): 2,911.9 − 800 = +2.11 L.
  await expect(page.getByTestId("what-if-iso-per100")).toContainText("+ 2.11 L against the method now");
});

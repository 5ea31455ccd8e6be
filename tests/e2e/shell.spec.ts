import { expect, test } from "@playwright/test";
import { signIn } from "./support";

test("the sign-in page renders in the app's own shell and fonts", async ({ page, baseURL }) => {
  const fontRequests: string[] = [];
  page.on("request", (request) => {
    if (request.resourceType() === "font") fontRequests.push(request.url());
  });
  await page.goto("/sign-in");
  await expect(page).toHaveTitle("Sign in · Decant");
  await expect(page.getByRole("main")).toBeVisible();
  await expect(page.getByRole("heading", { name: "Sign in" })).toBeVisible();
  await expect(page.getByLabel("E-mail address")).toBeVisible();

  await page.evaluate(() => document.fonts.ready);
  const plexLoaded = await page.evaluate(() => document.fonts.check('16px "IBM Plex Sans"'));
  expect(plexLoaded).toBe(true);
  // Fonts come from the app itself, never from a third-party host.
  expect(fontRequests.length).toBeGreaterThan(0);
  for (const url of fontRequests) expect(new URL(url).origin).toBe(new URL(baseURL!).origin);
});

test("a technician signs in and lands on an overview with the batches on the benches", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  await expect(page.getByRole("navigation", { name: "Main" })).toBeVisible();
  await expect(page.getByRole("heading", { name: "Bottles on the benches" })).toBeVisible();
  // The demo's current acetonitrile mix, coded by the day it was made.
  await expect(page.getByRole("cell", { name: /^B\d{2}-\d{4}(-\d+)?$/ }).first()).toBeVisible();
  await expect(page.getByText("never replace, your laboratory's SOPs")).toBeVisible();
});

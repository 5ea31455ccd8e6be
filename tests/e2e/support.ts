import { expect, type Page } from "@playwright/test";

export const DEMO_PASSWORD = "decant-demo";

/** Signs in through the form, as a person would, and waits for the overview. */
export async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
  await page.goto("/sign-in");
  // The form's fields stay disabled until React has hydrated it; Playwright waits for them.
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL(/\/home$/);
}

import { expect, test } from "@playwright/test";
import { signIn } from "./support";

// Refusals only the server can make (the value is valid, but taken) come back as a 409 whose
// `fields` name the field: the form shows the server's message at that field, as its accessible
// description, and not again on a line of its own.

test("inviting a person with an address that already has an account shows the refusal at the e-mail field", async ({ page }) => {
  await signIn(page, "admin@demo.test");
  await page.goto("/users");
  await page.getByRole("button", { name: "Invite a person" }).click();
  const form = page.getByRole("form", { name: "Invite a person" });
  await form.getByLabel("Name", { exact: true }).fill("Second account for the technician");
  const email = form.getByLabel("E-mail address");
  await email.fill("tech@demo.test");
  await form.getByLabel("Role").selectOption("technician");
  await form.getByRole("button", { name: "Send invitation" }).click();

  await expect(email).toHaveAccessibleDescription("There is already an account with this e-mail address");
  await expect(email).toHaveAttribute("aria-invalid", "true");
  await expect(email).toBeFocused();
  await expect(form.getByRole("alert")).toHaveCount(1);
  await expect(form.getByLabel("Name", { exact: true })).not.toHaveAttribute("aria-invalid", "true");

  // Changing the address clears the server's message (the form checks it again itself).
  await email.fill(`someone.new.${Date.now().toString(36)}@lab.test`);
  await expect(email).not.toHaveAttribute("aria-invalid", "true");
});

test("adding an instrument under a name in use shows the refusal at the name field", async ({ page }) => {
  await signIn(page, "manager@demo.test");
  await page.goto("/instruments");
  const form = page.getByRole("form", { name: "Add an instrument" });
  const name = form.getByLabel("Name");
  await name.fill("Wren");
  await form.getByLabel("System").fill("UHPLC, binary pump");
  await form.getByLabel("Room").fill("B2.14");
  await form.getByRole("button", { name: "Add the instrument" }).click();

  await expect(name).toHaveAccessibleDescription("is taken");
  await expect(name).toHaveAttribute("aria-invalid", "true");
  await expect(form.getByRole("alert")).toHaveCount(1);
  await expect(page).toHaveURL(/\/instruments$/);
});

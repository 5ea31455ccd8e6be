import { expect, test, type Page } from "@playwright/test";
import { navFor } from "../../src/components/shell/navigation";
import { ROLE_LABELS, type Role } from "../../src/lib/permissions";
import { setPasswordLink, waitForMail } from "../support/mailbox";
import { signIn } from "./support";

const DEMO: [Role, string][] = [
  ["technician", "tech@demo.test"],
  ["manager", "manager@demo.test"],
  ["safety", "safety@demo.test"],
  ["client", "client@demo.test"],
  ["admin", "admin@demo.test"],
];

/** What a person would check first: which sections their role opens, and which it must not. */
const MUST_SEE: Record<Role, string[]> = {
  technician: ["Overview", "Batches", "My account"],
  manager: ["Overview", "Batches", "People", "My account"],
  safety: ["Overview", "My account"],
  client: ["Overview", "My account"],
  admin: ["Overview", "Batches", "People", "Mail outbox (dev)", "My account"],
};
const MUST_NOT_SEE: Record<Role, string[]> = {
  technician: ["People", "Mail outbox (dev)"],
  manager: ["Mail outbox (dev)"],
  safety: ["People", "Mail outbox (dev)"],
  client: ["Batches", "People", "Mail outbox (dev)"],
  admin: [],
};

async function navLabels(page: Page) {
  return page.getByRole("navigation", { name: "Main" }).getByRole("link").allInnerTexts();
}

for (const [role, email] of DEMO) {
  test(`${role} signs in and sees the ${role}'s navigation`, async ({ page }) => {
    await signIn(page, email);
    await expect(page.getByTestId("current-role")).toHaveText(ROLE_LABELS[role]);
    const labels = await navLabels(page);
    expect(labels).toEqual(navFor(role, { devMail: true }).map((i) => i.label));
    for (const label of MUST_SEE[role]) expect(labels).toContain(label);
    for (const label of MUST_NOT_SEE[role]) expect(labels).not.toContain(label);
  });
}

test("a technician asking for the people page gets the not-for-your-role page", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  const response = await page.goto("/users");
  expect(response?.status()).toBe(403);
  await expect(page.getByRole("heading", { name: "This page is not open to your role" })).toBeVisible();
});

test("an admin invites a person, who sets a password through the mailed link and signs in; the link then fails", async ({
  page,
  browser,
}) => {
  const email = `new.tech.${Date.now().toString(36)}@lab.test`;
  const since = new Date();

  await signIn(page, "admin@demo.test");
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "People" }).click();
  await expect(page.getByRole("heading", { name: "People", level: 1 })).toBeVisible();
  await page.getByRole("button", { name: "Invite a person" }).click();
  const form = page.getByRole("form", { name: "Invite a person" });
  await form.getByLabel("Name", { exact: true }).fill("Noor Testwell");
  await form.getByLabel("E-mail address").fill(email);
  await form.getByLabel("Role").selectOption("technician");
  await form.getByRole("button", { name: "Send invitation" }).click();
  await expect(page.getByRole("status")).toHaveText(`Invitation sent to ${email}.`);
  const row = page.locator(`tr[data-user="${email}"]`);
  await expect(row).toContainText("Noor Testwell");
  await expect(row).toContainText("invited");

  // The invitation as the fake kept it, and as the admin sees it in the development outbox.
  const mail = await waitForMail(email, { since, subject: /invited/ });
  const link = setPasswordLink(mail);
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Mail outbox (dev)" }).click();
  await page
    .getByRole("row", { name: new RegExp(email.replace(/\./g, "\\.")) })
    .getByRole("link", { name: "You are invited to Decant" })
    .click();
  await expect(page.getByTestId("message-to")).toHaveText(email);
  await expect(page.getByTestId("message-text")).toContainText(link.toString());

  // The invitee, in a browser of their own.
  const context = await browser.newContext();
  const invitee = await context.newPage();
  await invitee.goto(link.toString());
  await expect(invitee.getByRole("heading", { name: "Welcome to Decant, Noor" })).toBeVisible();
  await invitee.getByLabel("New password", { exact: true }).fill("short");
  await invitee.getByLabel("Repeat the new password").fill("short");
  await invitee.getByRole("button", { name: "Set password" }).click();
  await expect(invitee.getByText("Use at least 12 characters")).toBeVisible();
  await invitee.getByLabel("New password", { exact: true }).fill("mobile phase at dawn");
  await invitee.getByLabel("Repeat the new password").fill("mobile phase at dawn");
  await invitee.getByRole("button", { name: "Set password" }).click();
  await expect(invitee).toHaveURL(/\/sign-in\?password-set=1/);
  await expect(invitee.getByText("Your password is set.")).toBeVisible();
  await expect(invitee.getByLabel("E-mail address")).toHaveValue(email);
  await invitee.getByLabel("Password").fill("mobile phase at dawn");
  await invitee.getByRole("button", { name: "Sign in" }).click();
  await expect(invitee).toHaveURL(/\/home$/);
  await expect(invitee.getByTestId("current-role")).toHaveText("Technician");
  expect(await navLabels(invitee)).toEqual(navFor("technician", { devMail: true }).map((i) => i.label));

  // The same link a second time.
  await invitee.goto(link.toString());
  await expect(invitee.getByRole("heading", { name: "This link no longer works" })).toBeVisible();
  await expect(invitee.getByLabel("New password", { exact: true })).toHaveCount(0);
  await context.close();

  // Back in the admin's list, the person is active and has signed in.
  await page.goto("/users");
  await expect(row).toContainText("active");
  await expect(row).not.toContainText("never");
});

test("a person changes their password on My account and stays signed in", async ({ page, browser }) => {
  // A fresh account, so the demo passwords stay as they are for every other test.
  const email = `changer.${Date.now().toString(36)}@lab.test`;
  const since = new Date();
  await signIn(page, "manager@demo.test");
  const invited = await page.request.post("/api/users", { data: { email, name: "Ola Changer", role: "safety" } });
  expect(invited.status()).toBe(201);
  const link = setPasswordLink(await waitForMail(email, { since }));
  const set = await page.request.post("/api/auth/set-password", {
    data: { token: link.searchParams.get("token"), newPassword: "first long password", confirmPassword: "first long password" },
  });
  expect(set.status()).toBe(200);

  const context = await browser.newContext();
  const person = await context.newPage();
  await signIn(person, email, "first long password");
  await person.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "My account" }).click();
  await expect(person.getByTestId("account-email")).toHaveText(email);
  await expect(person.getByTestId("account-role")).toHaveText("Safety officer");
  await person.getByLabel("Current password").fill("not the password");
  await person.getByLabel("New password", { exact: true }).fill("second long password");
  await person.getByLabel("Repeat the new password").fill("second long password");
  await person.getByRole("button", { name: "Change password" }).click();
  await expect(person.getByText("This is not your current password")).toBeVisible();
  await person.getByLabel("Current password").fill("first long password");
  await person.getByRole("button", { name: "Change password" }).click();
  await expect(person.getByText("Password changed.")).toBeVisible();
  await person.reload();
  await expect(person.getByTestId("account-email")).toHaveText(email);
  await context.close();
});

test("the forgotten-password form answers the same for any address", async ({ page }) => {
  await page.goto("/sign-in");
  await page.getByRole("link", { name: "Forgotten your password?" }).click();
  await page.getByLabel("E-mail address").fill("nobody-here@lab.test");
  await page.getByRole("button", { name: "Send me a link" }).click();
  await expect(page.getByRole("status")).toContainText("If an account exists for that address");
});

// Two-factor sign-in and open sessions as people meet them: scanning the QR code with "an app"
// (decoded from the screen, the codes computed from its key), the code step, ending a session from
// another browser, and a role an administrator says must use two-factor. Fresh accounts only, so
// the demo accounts the other specs sign in with keep signing in with their password alone.
import { decodeBase32IgnorePadding } from "@oslojs/encoding";
import { generateHOTP } from "@oslojs/otp";
import { expect, test, type Browser, type Page } from "@playwright/test";
import jsQR from "jsqr";
import { setPasswordLink, waitForMail } from "../support/mailbox";
import { signIn } from "./support";

const PASSWORD = "mobile phase at dawn";
const SHOTS = `${process.env.DECANT_TEST_DATA_DIR ?? ".data/test"}/screens`;

/** Reads the QR code on screen as a phone would: a screenshot of it, decoded. Returns the key it holds. */
async function scanQr(page: Page): Promise<string> {
  const png = (await page.getByTestId("totp-qr").screenshot()).toString("base64");
  const image = await page.evaluate(async (b64) => {
    const img = new Image();
    img.src = `data:image/png;base64,${b64}`;
    await img.decode();
    const canvas = document.createElement("canvas");
    [canvas.width, canvas.height] = [img.width, img.height];
    const ctx = canvas.getContext("2d")!;
    ctx.drawImage(img, 0, 0);
    return { width: img.width, height: img.height, data: Array.from(ctx.getImageData(0, 0, img.width, img.height).data) };
  }, png);
  const decoded = jsQR(Uint8ClampedArray.from(image.data), image.width, image.height);
  expect(decoded, "the QR code on screen decodes").not.toBeNull();
  const uri = new URL(decoded!.data);
  expect(uri.protocol).toBe("otpauth:");
  expect(uri.searchParams.get("issuer")).toBe("Decant");
  return uri.searchParams.get("secret")!;
}

/** The code an authenticator app shows now (RFC 6238: 30-second steps), or `offsetSteps` later. */
function codeFor(secret: string, offsetSteps = 0) {
  return generateHOTP(decodeBase32IgnorePadding(secret), BigInt(Math.floor(Date.now() / 30_000) + offsetSteps), 6);
}

async function invite(page: Page, role: string) {
  const email = `${role}.${Date.now().toString(36)}@lab.test`;
  const since = new Date();
  expect((await page.request.post("/api/users", { data: { email, name: "Robin Quell", role } })).status()).toBe(201);
  const token = setPasswordLink(await waitForMail(email, { since })).searchParams.get("token");
  expect(
    (await page.request.post("/api/auth/set-password", { data: { token, newPassword: PASSWORD, confirmPassword: PASSWORD } })).status(),
  ).toBe(200);
  return email;
}

async function freshPage(browser: Browser, width = 1366) {
  const context = await browser.newContext({ viewport: { width, height: 900 } });
  return { context, page: await context.newPage() };
}

test("a person turns on two-factor on My account, and signs in with a code from then on", async ({ page, browser }) => {
  await signIn(page, "admin@demo.test");
  const email = await invite(page, "technician");
  const { context, page: person } = await freshPage(browser);
  await signIn(person, email, PASSWORD);
  await person.goto("/account");
  const section = person.getByRole("region", { name: "Two-factor sign-in" });
  await section.getByLabel("Your password").fill(PASSWORD);
  await section.getByRole("button", { name: "Set up with an authenticator app" }).click();
  await expect(section.getByTestId("totp-qr")).toBeVisible();
  await person.screenshot({ path: `${SHOTS}/account-two-factor-qr-1366.png`, fullPage: true });
  const secret = await scanQr(person);
  await section.getByLabel("Code from the app").fill(codeFor(secret));
  await section.getByRole("button", { name: "Turn on two-factor sign-in" }).click();
  await expect(section.getByText("Two-factor sign-in is on.")).toBeVisible();
  const codes = await section.getByTestId("recovery-codes").locator("li").allInnerTexts();
  expect(codes).toHaveLength(10);
  await expect(section.getByRole("button", { name: "Done" })).toBeDisabled();
  await section.getByLabel("I have saved these codes").check();
  await section.getByRole("button", { name: "Done" }).click();
  await expect(person.getByTestId("two-factor-state")).toContainText("10 of 10 recovery codes left");

  // A new browser: password, then the code page; a wrong code is refused, the right one opens Decant.
  const { context: other, page: later } = await freshPage(browser, 390);
  await later.goto("/sign-in");
  await later.getByLabel("E-mail address").fill(email);
  await later.getByLabel("Password").fill(PASSWORD);
  await later.getByRole("button", { name: "Sign in" }).click();
  await expect(later).toHaveURL(/\/sign-in\/code\?next=%2Fhome$/);
  await expect(later.getByRole("heading", { name: "One more step" })).toBeVisible();
  await later.getByLabel("Code from your authenticator app").fill(codeFor(secret) === "000000" ? "111111" : "000000");
  await later.getByRole("button", { name: "Continue" }).click();
  await expect(later.getByRole("alert")).toHaveText("That code is not right.");
  await later.screenshot({ path: `${SHOTS}/sign-in-code-390.png`, fullPage: true });
  // The code used to turn it on is spent: the app's next one.
  await later.getByLabel("Code from your authenticator app").fill(codeFor(secret, 1));
  await later.getByRole("button", { name: "Continue" }).click();
  await expect(later).toHaveURL(/\/home$/);
  await other.close();

  // Back on My account: this browser and the other one are listed; ending the other signs it out.
  await person.goto("/account");
  const sessions = person.getByRole("table", { name: "Open sessions" });
  await expect(sessions.locator("tbody tr")).toHaveCount(2);
  await expect(sessions.getByText("This browser")).toBeVisible();
  await expect(person.getByRole("table", { name: "Recent sign-ins" })).toContainText("Signed in");
  await expect(person.getByRole("table", { name: "Recent sign-ins" })).toContainText("Wrong code");
  await person.screenshot({ path: `${SHOTS}/account-sessions-1366.png`, fullPage: true });
  await sessions.locator("tbody tr", { hasNotText: "This browser" }).getByRole("button", { name: "End" }).click();
  await expect(person.getByRole("status")).toContainText("Signed out");
  await expect(sessions.locator("tbody tr")).toHaveCount(1);
  await context.close();
});

test("an administrator requires two-factor for managers: a manager without it is led to set it up before Decant opens", async ({
  page,
  browser,
}) => {
  await signIn(page, "admin@demo.test");
  const email = await invite(page, "manager");
  await page.goto("/settings/sign-in");
  await page.screenshot({ path: `${SHOTS}/settings-sign-in-1366.png`, fullPage: true });
  const form = page.getByRole("form", { name: "Sign-in settings" });
  await form.getByLabel("Facility manager").check();
  await form.getByRole("button", { name: "Save settings" }).click();
  await expect(page.getByRole("status")).toContainText("Saved");
  try {
    const { context, page: manager } = await freshPage(browser, 390);
    await manager.goto("/sign-in");
    await manager.getByLabel("E-mail address").fill(email);
    await manager.getByLabel("Password").fill(PASSWORD);
    await manager.getByRole("button", { name: "Sign in" }).click();
    await expect(manager).toHaveURL(/\/sign-in\/two-factor-setup/);
    await expect(manager.getByRole("heading", { name: "Set up two-factor sign-in" })).toBeVisible();
    // Not into the app: any page leads back to this step.
    await manager.goto("/statements");
    await expect(manager).toHaveURL(/\/sign-in\/two-factor-setup/);
    await manager.getByRole("button", { name: "Set up with an authenticator app" }).click();
    const secret = await scanQr(manager);
    await manager.getByLabel("Code from the app").fill(codeFor(secret));
    await manager.getByRole("button", { name: "Turn on two-factor sign-in" }).click();
    await expect(manager.getByTestId("recovery-codes").locator("li")).toHaveCount(10);
    await manager.screenshot({ path: `${SHOTS}/sign-in-recovery-codes-390.png`, fullPage: true });
    await manager.getByLabel("I have saved these codes").check();
    await manager.getByRole("button", { name: "Continue to Decant" }).click();
    await expect(manager).toHaveURL(/\/statements$/);
    await expect(manager.getByTestId("current-role")).toHaveText("Facility manager");
    await context.close();
  } finally {
    const current = (await (await page.request.get("/api/settings/sign-in")).json()) as {
      settings: { sessions: { twoFactorRoles: string[] } };
    };
    current.settings.sessions.twoFactorRoles = [];
    expect((await page.request.put("/api/settings/sign-in", { data: current.settings })).status()).toBe(200);
  }
});

test("the sign-in page offers the shared-bench option, with its idle limit", async ({ page }) => {
  await page.goto("/sign-in");
  await expect(page.getByLabel("This is a shared bench computer")).toBeVisible();
  await expect(page.getByText("Signs you out after 15 minutes without use")).toBeVisible();
  await page.setViewportSize({ width: 390, height: 800 });
  await page.screenshot({ path: `${SHOTS}/sign-in-390.png`, fullPage: true });
});

import { expect, test } from "@playwright/test";
import { signIn } from "./support";

// The safety officer's journey: review the solvent waste totals.
test("the safety officer reviews the waste totals, requests a pickup for a near-full container and swaps it", async ({ page }) => {
  await signIn(page, "safety@demo.test");
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Waste" }).click();
  await expect(page.getByRole("heading", { name: "Solvent waste" })).toBeVisible();

  // Pick a period: this quarter has three months of demo runs in it.
  await page.getByRole("group", { name: "Period presets" }).getByRole("link", { name: "This quarter" }).click();
  await expect(page).toHaveURL(/period=quarter/);
  await expect(page.getByTestId("period")).toContainText(/Period \d{4}-(01|04|07|10)-01 to/);

  // Totals by stream: the organic stream carries most of it, and the figure is the API's.
  const streams = page.getByRole("region", { name: "Totals by stream" });
  const organic = streams.locator('tr[data-stream="non-halogenated-organic"]');
  await expect(organic).toContainText("Non-halogenated organic");
  const period = (await page.getByTestId("period").innerText()).match(/(\d{4}-\d{2}-\d{2}) to (\d{4}-\d{2}-\d{2})/)!;
  const api = await page.request.get(`/api/waste/summary?from=${period[1]}&to=${period[2]}`);
  const summary = (await api.json()) as { streams: { stream: string; volume_mL: number }[] };
  const litres = summary.streams.find((s) => s.stream === "non-halogenated-organic")!.volume_mL / 1000;
  expect(litres).toBeGreaterThan(1);
  await expect(organic).toContainText(`${litres.toLocaleString("en-GB", { maximumFractionDigits: 2 })} L`);

  // By room: both labs of the facility.
  const rooms = page.getByRole("region", { name: "By room" });
  await expect(rooms.locator('tr[data-room="B2.14"]')).toBeVisible();
  await expect(rooms.locator('tr[data-room="B2.16"]')).toBeVisible();

  // A container near full, flagged, with the caution that the institution's rules decide.
  const carboy = page.getByTestId("container-WC-0103");
  await expect(carboy.locator(".tag").first()).toContainText(/near full|over capacity/);
  await expect(page.getByRole("region", { name: "Needs attention" })).toContainText("WC-0103");
  await expect(page.getByText("your institution's rules and local regulations decide").first()).toBeVisible();

  // The report downloads as a PDF.
  const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "Download report (PDF)" }).click()]);
  expect(download.suggestedFilename()).toMatch(/^decant-waste-.*\.pdf$/);

  // Request its pickup.
  await carboy.getByRole("button", { name: "Request pickup" }).click();
  await carboy.getByLabel("Note for the collector (optional)").fill("Halogenated carboy under Heron, near full");
  await carboy.getByRole("button", { name: /Confirm pickup of WC-0103/ }).click();
  await expect(carboy.getByRole("status")).toContainText(/Pickup PU-\d{4}-\d{3} requested for WC-0103/);
  await expect(page.getByRole("heading", { name: /Waiting for pickup/ })).toBeVisible();
  await expect(page.getByTestId("container-WC-0103")).toContainText(/Pickup PU-\d{4}-\d{3} requested/);

  // Heron no longer drains into it: put a fresh halogenated carboy under it.
  await page.goto("/waste/containers");
  const form = page.getByRole("form", { name: "New container" });
  await form.getByLabel("Container code").fill("WC-0110");
  await form.getByLabel("Waste stream").selectOption({ label: "Halogenated organic" });
  await form.getByLabel("Capacity (mL)").fill("10000");
  await form.getByLabel("Room").fill("B2.16");
  await form.getByLabel("Location", { exact: true }).selectOption("instrument");
  await form.getByLabel("Where exactly (optional)").fill("Under Heron");
  await form.getByLabel("Instrument draining into it").selectOption({ label: "Heron (B2.16)" });
  await form.getByRole("button", { name: "Add container" }).click();
  await expect(page.getByRole("heading", { name: /WC-0110 · Halogenated organic/ })).toBeVisible();
  await expect(page.getByText("Heron drains into it")).toBeVisible();
});

test("technicians and clients cannot reach the waste limits", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  await page.goto("/waste/settings");
  await expect(page.getByRole("heading", { name: "This page is not open to your role" })).toBeVisible();
  await page.goto("/waste");
  await expect(page.getByRole("link", { name: "Limits" })).toHaveCount(0);

  await page.context().clearCookies();
  await signIn(page, "client@demo.test");
  await page.goto("/waste/settings");
  await expect(page.getByRole("heading", { name: "This page is not open to your role" })).toBeVisible();
  await page.goto("/waste");
  await expect(page.getByRole("heading", { name: "This page is not open to your role" })).toBeVisible();
});

import { readFileSync } from "node:fs";
import { expect, test } from "@playwright/test";
import { parseCsv } from "../../src/lib/imports/csv";
import { signIn } from "./support";

test("a technician filters and sorts the stock lots, bookmarks the view and exports exactly what it shows", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Stock lots" }).click();
  await page.getByLabel("Show").selectOption("usable");
  await page.getByRole("button", { name: "Show" }).click();
  await expect(page).toHaveURL(/state=usable/);

  const table = page.getByTestId("stock-lots");
  await table.getByRole("link", { name: /^Lot/ }).click();
  await expect(page).toHaveURL(/sort=lot&dir=asc/);
  await table.getByRole("link", { name: /^Lot/ }).click();
  await expect(page).toHaveURL(/state=usable.*sort=lot&dir=desc/);
  await expect(table.getByRole("columnheader", { name: /^Lot/ })).toHaveAttribute("aria-sort", "descending");

  const lotCells = table.locator('tbody td[data-label="Lot"]');
  const shown = await lotCells.allTextContents();
  expect(shown.length).toBeGreaterThan(1);
  expect(shown).toEqual([...shown].sort().reverse());
  await expect(table.getByText("expired", { exact: true })).toHaveCount(0);

  // The address is the view: opened afresh it shows the same rows in the same order.
  await page.goto(page.url());
  await expect(lotCells).toHaveText(shown);

  const downloading = page.waitForEvent("download");
  await page.getByTestId("list-export").click();
  const download = await downloading;
  const [header, ...rows] = parseCsv(readFileSync((await download.path())!, "utf8")).map((r) => r.fields);
  const lotColumn = header!.indexOf("lot_number");
  expect(rows.map((r) => r[lotColumn])).toEqual(shown.map((s) => s.trim()));

  await page.setViewportSize({ width: 390, height: 800 });
  await expect(table.locator("thead")).toBeHidden();
  await expect(lotCells.first()).toBeVisible();
});

test("a manager follows a record's History link to its audit trail, filters it by person and exports it", async ({ page }) => {
  const name = `Lark ${Date.now().toString(36)}`;
  await signIn(page, "manager@demo.test");
  await page.goto("/instruments");
  const form = page.getByRole("form", { name: "Add an instrument" });
  await form.getByLabel("Name").fill(name);
  await form.getByLabel("System").fill("HPLC, quaternary pump");
  await form.getByLabel("Room").fill("B2.16");
  await form.getByRole("button", { name: "Add the instrument" }).click();
  await expect(page.getByRole("row").filter({ hasText: name })).toBeVisible();
  await page.getByRole("row").filter({ hasText: name }).getByRole("link", { name: "Change" }).click();
  await page.getByTestId("history-link").click();

  await expect(page.getByRole("heading", { name: "Audit trail" })).toBeVisible();
  await expect(page.getByRole("status")).toContainText("History of instrument");
  const audit = page.getByTestId("audit");
  const line = audit.locator("tbody tr").filter({ hasText: "instrument.create" });
  await expect(line).toHaveCount(1);
  await expect(line.locator('td[data-label="Who"]')).toHaveText("Priya Castellan");
  await expect(line.locator('td[data-label="Before → after"]')).toContainText(name);

  await page.getByLabel("Person").selectOption({ label: "Priya Castellan" });
  await page.getByRole("button", { name: "Show" }).click();
  await expect(page).toHaveURL(/actor=\d+/);
  await expect(page).toHaveURL(/entityId=\d+/);
  await expect(line).toHaveCount(1);

  const downloading = page.waitForEvent("download");
  await page.getByTestId("list-export").click();
  const text = readFileSync((await (await downloading).path())!, "utf8");
  const [header, ...rows] = parseCsv(text).map((r) => r.fields);
  expect(header).toEqual(expect.arrayContaining(["at", "person", "action", "entity", "changes", "before", "after"]));
  expect(rows.some((r) => r[header!.indexOf("action")] === "instrument.create" && r[header!.indexOf("changes")]!.includes(name))).toBe(
    true,
  );
});

test("the audit trail is not in a technician's reach", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  await expect(page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Audit trail" })).toHaveCount(0);
  const response = await page.goto("/audit");
  expect(response?.status()).toBe(403);
});

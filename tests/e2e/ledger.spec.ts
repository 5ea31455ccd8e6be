import { expect, test, type Locator, type Page } from "@playwright/test";
import { formatVolumeIn, volumeUnitFor } from "../../src/lib/ledger/volume-unit";
import { signIn } from "./support";

/**
 * Fills the run form as a technician would: the demo scout gradient on Wren for PMG-ROOT-26,
 * 10 injections + 2 blanks + 5 mL purge, the demo's current batches 4 (A) and 5 (B), and records it.
 * Worked by hand: A = 12 × 3.522 + 5 = 47.264 mL, B = 12 × 2.478 + 5 = 34.736 mL (see
 * tests/integration/ledger/runs-ledger.test.ts). Answers channel A's batch option as it was before.
 */
async function recordScoutRun(page: Page) {
  await page.goto("/runs/new");
  await page.getByLabel("Instrument").selectOption({ label: "Wren" });
  await page.getByLabel("Method").selectOption({ label: "Scout gradient 5–95 % B, 12 min" });
  await page.getByLabel("Project").selectOption({ label: "PMG-ROOT-26 · Root exudate profiling" });
  await page.getByLabel("Injections").fill("10");
  await page.getByLabel("Extra blanks").fill("2");
  await page.getByLabel("Purge / prime per channel, mL").fill("5");
  const channelA = page.getByLabel(/^Channel A/);
  const optionA = channelA.locator('option[value="4"]');
  const before = Number(await optionA.getAttribute("data-ml"));
  await channelA.selectOption({ value: (await optionA.getAttribute("value")) ?? "" });
  const channelB = page.getByLabel(/^Channel B/);
  await channelB.selectOption({ value: "5" });
  // The live preview shows what the run will take from each bottle.
  await expect(page.getByText("Channel A", { exact: true }).locator("xpath=following-sibling::dd[1]")).toHaveText("47.3 mL");
  await expect(page.getByText("Channel B", { exact: true }).locator("xpath=following-sibling::dd[1]")).toHaveText("34.7 mL");
  await page.getByRole("button", { name: "Record the run" }).click();
  await expect(page.getByTestId("run-recorded")).toContainText("Run recorded");
  return { optionA, before };
}

test("a technician logs a run in the browser and sees the batch's remaining volume drop", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  const { optionA, before } = await recordScoutRun(page);

  const recorded = page.getByTestId("run-recorded");
  const code = /B\d{2}-\d{4}(-\d+)?/.exec(await optionA.innerText())![0];
  const after = Number(await page.getByTestId(`left-${code}`).getAttribute("data-ml"));
  expect(before - after).toBeCloseTo(47.264, 4);
  // The batch list in the form shows the new remaining volume too.
  await expect(optionA).toHaveAttribute("data-ml", String(after));
  await page.screenshot({ path: `${process.env.DECANT_TEST_DATA_DIR ?? ".data/test"}/playwright-output/ledger-run.png`, fullPage: true });

  await recorded.getByRole("link", { name: "See the ledger entries" }).click();
  // Reagents by name, volumes to 0.01 mL, the waste stream by name.
  await expect(page.getByRole("cell", { name: "Water", exact: true })).toBeVisible();
  await expect(page.getByRole("cell", { name: "47.22 mL" })).toBeVisible();
  await expect(page.getByRole("cell", { name: /Non-halogenated organic/ }).first()).toBeVisible();
});

const day = (daysAgo: number) => new Date(Date.now() - daysAgo * 86_400_000).toISOString().slice(0, 10);

test("a run a technician logs shows in the project's usage, up by exactly the run's volume", async ({ browser }) => {
  // Usage is the facility manager's view (technicians do not see costs); the two work side by side.
  const manager = await (await browser.newContext()).newPage();
  await signIn(manager, "manager@demo.test");
  const usageOf = async () => {
    await manager.goto(`/usage?from=${day(30)}&to=${day(0)}`);
    const total = manager
      .getByRole("table", { name: "Usage per project" })
      .locator("tr[data-project='PMG-ROOT-26'] [data-testid='usage-total']");
    await expect(total).toBeVisible();
    const api = (await (await manager.request.get(`/api/usage?from=${day(30)}&to=${day(0)}&groupBy=project`)).json()) as {
      rows: { projectCode: string; volumes_mL: Record<string, number> }[];
    };
    const sum = (r?: { volumes_mL: Record<string, number> }) => Object.values(r?.volumes_mL ?? {}).reduce((a, b) => a + b, 0);
    const row = api.rows.find((r) => r.projectCode === "PMG-ROOT-26");
    // The totals column has one unit for all its rows.
    return { shown: await total.innerText(), mL: sum(row), unit: volumeUnitFor(api.rows.map(sum)) };
  };
  const before = await usageOf();

  const technician = await (await browser.newContext()).newPage();
  await signIn(technician, "tech@demo.test");
  await recordScoutRun(technician);

  const after = await usageOf();
  expect(after.mL - before.mL).toBeCloseTo(47.264 + 34.736, 3);
  // The page shows the same totals as the API, before and after.
  expect(before.shown).toBe(formatVolumeIn(before.mL, before.unit));
  expect(after.shown).toBe(formatVolumeIn(after.mL, after.unit));
  await expect(manager.getByRole("img", { name: /per project$/ })).toHaveAccessibleDescription(/PMG-ROOT-26: /);
});

/** What the first column of the usage table shows, row by row. */
const tableGroups = (table: Locator) => table.locator("tbody tr td:first-child").allInnerTexts();

/** The bars the usage chart draws, in order (the canvas lists them in `data-groups`). */
const chartGroups = async (chart: Locator) => JSON.parse((await chart.getAttribute("data-groups")) ?? "[]") as string[];

test("a manager sees the usage table and its chart for a period, under the page's security policy", async ({ page }) => {
  // Anything the policy refuses (an injected style or script) is recorded here.
  await page.addInitScript(() => {
    const seen: string[] = [];
    Object.assign(window, { cspViolations: seen });
    document.addEventListener("securitypolicyviolation", (e) => seen.push(`${e.violatedDirective} ${e.blockedURI}`));
  });
  await signIn(page, "manager@demo.test");
  const response = await page.goto(`/usage?from=${day(30)}&to=${day(0)}`);
  expect(response?.headers()["content-security-policy"]).toMatch(/style-src 'self' 'nonce-[^']+'/);
  const table = page.getByRole("table", { name: "Usage per project" });
  await expect(table).toBeVisible();
  // A longer period: the island fetches GET /api/usage again.
  await page.getByLabel("From").fill(day(60));
  await expect(page).toHaveURL(new RegExp(`from=${day(60)}`));
  await expect(page.getByRole("figure")).toContainText(`${day(60)} to ${day(0)}`);
  await expect(table.locator("tr[data-project='PMG-ROOT-26']")).toBeVisible();
  await expect(table.locator("tr[data-project='QFT-IMP-014']")).toContainText("€");

  // The chart draws one bar per row of the table, in the table's order, in Decant's teal.
  const chart = page.getByRole("img", { name: /^Bar chart of the volume( and cost)? per project$/ });
  await expect(chart).toBeVisible();
  await expect.poll(() => chartGroups(chart)).toEqual(await tableGroups(table));
  await expect(chart).toHaveAccessibleDescription(/PMG-ROOT-26: [\d.,]+ (mL|L)/);
  await expect
    .poll(() =>
      chart.evaluate((canvas: HTMLCanvasElement) => {
        const { data } = canvas.getContext("2d")!.getImageData(0, 0, canvas.width, canvas.height);
        let teal = 0;
        for (let i = 0; i < data.length; i += 4) if (data[i] === 0x14 && data[i + 1] === 0x5f && data[i + 2] === 0x66) teal++;
        return teal;
      }),
    )
    .toBeGreaterThan(500);

  // The chart follows the table's filter and grouping.
  await page.getByLabel("Filter").fill("QFT");
  await expect(table.locator("tbody tr")).toHaveCount(2);
  await expect.poll(() => chartGroups(chart)).toEqual(await tableGroups(table));
  await page.getByLabel("Filter").fill("");
  await page.getByLabel("Group by").selectOption("client");
  const byClient = page.getByRole("table", { name: "Usage per client" });
  await expect(byClient).toBeVisible();
  const clientChart = page.getByRole("img", { name: /^Bar chart of the volume( and cost)? per client$/ });
  await expect.poll(() => chartGroups(clientChart)).toEqual(await tableGroups(byClient));
  expect(await page.evaluate(() => (window as unknown as { cspViolations: string[] }).cspViolations)).toEqual([]);
  await page.screenshot({ path: `${process.env.DECANT_TEST_DATA_DIR ?? ".data/test"}/playwright-output/ledger-usage.png`, fullPage: true });
});

test("the usage table stays usable when the chart cannot be loaded", async ({ page }) => {
  await signIn(page, "manager@demo.test");
  await page.route(/\/_astro\/UsageChart\.[^/]+\.js$/, (route) => route.abort());
  await page.goto(`/usage?from=${day(60)}&to=${day(0)}`);
  await expect(page.getByText("The chart could not be loaded. The table above has every figure.")).toBeVisible();
  const table = page.getByRole("table", { name: "Usage per project" });
  await page.getByLabel("Filter").fill("QFT");
  await expect(table.locator("tbody tr")).toHaveCount(2);
  await expect(page.getByRole("img", { name: /^Bar chart/ })).toHaveCount(0);
});

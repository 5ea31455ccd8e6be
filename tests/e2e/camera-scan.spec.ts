import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { chromium, expect, test, type Browser } from "@playwright/test";
import { signIn } from "./support";

/**
 * The whole path from a camera frame to the opened batch: Chromium's fake camera plays a video made
 * (pdftoppm, ffmpeg) from the label Decant renders for B26-1103; pressing "Scan" must open that batch.
 */
const dir = mkdtempSync(join(tmpdir(), "decant-camera-"));
test.afterAll(() => rmSync(dir, { recursive: true, force: true }));
const baseURL = process.env.E2E_BASE_URL ?? "http://127.0.0.1:4331";

async function cameraBrowser(video: string): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    args: ["--no-sandbox", "--disable-gpu", "--use-fake-device-for-media-stream", `--use-file-for-fake-video-capture=${video}`],
  });
}

test("a label held in front of the camera opens its batch", async ({ page }) => {
  test.setTimeout(90_000);
  // The label, as Decant renders it, turned into one second of camera video.
  await signIn(page, "tech@demo.test");
  const { href } = (await (await page.request.get("/api/batches/lookup?code=B26-1103")).json()) as { href: string };
  const pdf = await (await page.request.get(`/api/batches/${href.split("/").pop()}/label.pdf`)).body();
  writeFileSync(join(dir, "label.pdf"), pdf);
  execFileSync("pdftoppm", ["-r", "200", "-png", "-singlefile", "-f", "1", "-l", "1", join(dir, "label.pdf"), join(dir, "label")]);
  const video = join(dir, "label.y4m");
  execFileSync("ffmpeg", [
    "-v", "error", "-y", "-loop", "1", "-i", join(dir, "label.png"), "-t", "1", "-r", "5",
    "-vf", "scale=1200:-2,pad=1280:720:(ow-iw)/2:(oh-ih)/2:white,format=yuv420p", "-f", "yuv4mpegpipe", video,
  ]); // prettier-ignore

  const browser = await cameraBrowser(video);
  try {
    const context = await browser.newContext({ baseURL, permissions: ["camera"], viewport: { width: 390, height: 844 } });
    const phone = await context.newPage();
    await signIn(phone, "tech@demo.test");
    await phone.goto("/batches");
    // Nothing of the scanner is loaded before "Scan" is pressed.
    const scripts: string[] = [];
    phone.on("request", (r) => scripts.push(r.url()));
    expect(scripts.filter((u) => /camera-scanner|ponyfill|\.wasm/.test(u))).toEqual([]);
    await phone.getByRole("button", { name: "Scan" }).click();
    await expect(phone).toHaveURL(new RegExp(`${href}$`), { timeout: 30_000 });
    await expect(phone.getByRole("heading", { level: 1 })).toHaveText("B26-1103");
    expect(scripts.some((u) => u.endsWith(".wasm"))).toBe(true); // the reader came from Decant itself
    expect(scripts.filter((u) => /^https?:/.test(u) && !u.startsWith(baseURL))).toEqual([]);
  } finally {
    await browser.close();
  }
});

test("without the camera's permission the look-up says so and the code can still be typed", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  await page.goto("/batches");
  await page.getByRole("button", { name: "Scan" }).click();
  await expect(page.getByRole("alert")).toContainText(/Type the code instead/);
  await page.getByLabel("Batch code").fill("B26-1103");
  await page.getByRole("button", { name: "Open", exact: true }).click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("B26-1103");
});

test("a code that is not Decant's is said before anything opens", async ({ page }) => {
  await signIn(page, "tech@demo.test");
  await page.goto("/batches");
  await page.getByLabel("Batch code").fill("4006381333931");
  await page.getByRole("button", { name: "Open", exact: true }).click();
  await expect(page.getByRole("alert")).toContainText("is not a Decant batch code");
});

import { defineConfig } from "@playwright/test";

// Debian's Chromium, never a downloaded browser. `npm test` starts the app and passes its URL.
export default defineConfig({
  testDir: "tests/e2e",
  fullyParallel: false,
  workers: 1,
  retries: 0,
  timeout: 30_000,
  outputDir: `${process.env.DECANT_TEST_DATA_DIR ?? ".data/test"}/playwright-output`,
  // The desktop project runs every spec; phone and tablet run the bench journeys (tests/e2e/journeys).
  projects: [
    { name: "desktop", use: { viewport: { width: 1366, height: 900 } } },
    { name: "tablet", testMatch: "journeys/**", use: { viewport: { width: 820, height: 1180 }, hasTouch: true } },
    { name: "phone", testMatch: "journeys/**", use: { viewport: { width: 390, height: 844 }, hasTouch: true, isMobile: true } },
  ],
  use: {
    baseURL: process.env.E2E_BASE_URL ?? "http://127.0.0.1:4331",
    viewport: { width: 1366, height: 900 },
    trace: "off",
    launchOptions: {
      executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
      args: [
        "--no-sandbox",
        "--disable-gpu",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        "--no-first-run",
        "--disable-quic",
      ],
    },
  },
});

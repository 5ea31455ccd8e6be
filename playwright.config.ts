import { defineConfig } from "@playwright/test";

// Debian's Chromium, never a downloaded browser. `npm test` starts the app and passes its URL.
export default defineConfig({
  testDir: "tests/e2e",
  fullyParallel: false,
  workers: 1,
  retries: 0,
  timeout: 30_000,
  outputDir: `${process.env.DECANT_TEST_DATA_DIR ?? ".data/test"}/playwright-output`,
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

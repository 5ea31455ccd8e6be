import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";

export default defineConfig({
  resolve: { alias: { "~": fileURLToPath(new URL("./src", import.meta.url)) } },
  test: {
    include: ["tests/unit/**/*.test.ts", "tests/integration/**/*.test.ts"],
    // Integration tests share one private MariaDB; each worker gets its own database (tests/integration/setup.ts).
    poolOptions: { forks: { maxForks: 2, minForks: 1 } },
    pool: "forks",
    testTimeout: 30_000,
    hookTimeout: 120_000,
  },
});

// @ts-check
// The framework's own floor for the HTTP benchmark: an Astro app in the same server mode, with
// the same adapter, and nothing of Decant's (no middleware, no database). Built by http.bench.ts.
import { defineConfig } from "astro/config";
import node from "@astrojs/node";

export default defineConfig({
  output: "server",
  outDir: process.env.FLOOR_OUT_DIR ?? "./dist",
  adapter: node({ mode: "standalone" }),
});

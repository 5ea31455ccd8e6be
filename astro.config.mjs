// @ts-check
import { defineConfig } from "astro/config";
import node from "@astrojs/node";
import react from "@astrojs/react";
import tailwindcss from "@tailwindcss/vite";

export default defineConfig({
  output: "server",
  // Parallel test runs build into their own folders (scripts/test.mjs sets DECANT_OUT_DIR).
  outDir: process.env.DECANT_OUT_DIR ?? "./dist",
  adapter: node({ mode: "standalone" }),
  integrations: [react()],
  server: { host: "127.0.0.1", port: 4321 },
  // The origin check lives in src/middleware.ts for forms and JSON alike: it compares Origin with
  // the Host header, because Astro's own check compares with a URL that is only right once
  // security.allowedDomains lists every host name the app is reached by.
  security: { checkOrigin: false },
  vite: {
    plugins: [tailwindcss()],
    ssr: {
      // Native or CommonJS-heavy server packages stay outside the bundle.
      external: ["sequelize", "mariadb", "@node-rs/argon2", "nodemailer", "smtp-server", "stripe"],
    },
  },
});

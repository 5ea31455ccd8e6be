import { spawnSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { EnvError, parseEnv } from "../../src/lib/server/env";

const good = { DATABASE_NAME: "decant", DATABASE_USER: "decant", DATABASE_PASSWORD: "secret" };

describe("environment parsing", () => {
  it("accepts a complete environment and applies defaults", () => {
    const env = parseEnv(good);
    expect(env.DATABASE_PORT).toBe(3307);
    expect(env.SMTP_SECURE).toBe(false);
  });

  it.each([
    ["DATABASE_PORT", { ...good, DATABASE_PORT: "not-a-port" }],
    ["DATABASE_PORT", { ...good, DATABASE_PORT: "70000" }],
    ["DATABASE_NAME", { ...good, DATABASE_NAME: "decant; DROP" }],
    ["DATABASE_PASSWORD", { DATABASE_NAME: "decant", DATABASE_USER: "decant" }],
    ["APP_ORIGIN", { ...good, APP_ORIGIN: "not a url" }],
    ["SMTP_SECURE", { ...good, SMTP_SECURE: "yes" }],
  ])("names %s when it is bad or missing", (name, source) => {
    expect(() => parseEnv(source)).toThrow(EnvError);
    expect(() => parseEnv(source)).toThrow(new RegExp(name));
  });

  it("stops start-up with a message naming the variable", () => {
    const result = spawnSync("node_modules/.bin/tsx", ["src/db/cli.ts", "migrate"], {
      env: { PATH: process.env.PATH, ...good, DATABASE_PORT: "abc" },
      encoding: "utf8",
    });
    expect(result.status).toBe(1);
    expect(result.stderr).toMatch(/DATABASE_PORT/);
    expect(result.stderr).not.toMatch(/at .*\.ts:\d+/); // one clear line, not a stack trace
  });
});

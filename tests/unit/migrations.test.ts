import { readdirSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { DEV_SEEDERS, MIGRATIONS, SEEDERS } from "../../src/db/umzug";

describe.each([
  ["migrations", MIGRATIONS],
  ["seeders", SEEDERS],
  ["dev-seeders", DEV_SEEDERS],
])("src/db/%s", (folder, registered) => {
  const files = readdirSync(`src/db/${folder}`).filter((f) => f.endsWith(".ts"));

  it("registers every file in the folder, and nothing else", () => {
    expect(Object.keys(registered).sort()).toEqual(files.sort());
  });

  it("uses timestamped names that sort in run order", () => {
    for (const file of files) expect(file).toMatch(/^\d{4}\.\d{2}\.\d{2}T\d{2}\.\d{2}\.\d{2}\.[a-z0-9-]+\.ts$/);
  });

  it("gives every entry an up step", () => {
    for (const module of Object.values(registered)) expect(typeof module.up).toBe("function");
  });
});

// `npm start` serves an existing build only when it was built from exactly the current sources.
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { buildIsCurrent, sourceStamp, stampBuild } from "../../../scripts/lib/build-stamp.mjs";

let root: string;
const write = (path: string, text: string) => {
  mkdirSync(join(root, path, ".."), { recursive: true });
  writeFileSync(join(root, path), text);
};
/** A finished build in root/dist, stamped with the sources as they are now. */
const build = () => {
  write("dist/server/entry.mjs", "// built");
  stampBuild(join(root, "dist"), sourceStamp(root));
};

beforeEach(() => {
  root = mkdtempSync(join(tmpdir(), "decant-stamp-"));
  write("src/pages/index.astro", "<h1>Overview</h1>");
  write("astro.config.mjs", "export default {}");
  write("package-lock.json", "{}");
});
afterEach(() => rmSync(root, { recursive: true, force: true }));

describe("build stamp", () => {
  it("finds a build of the current sources current", () => {
    build();
    expect(buildIsCurrent(join(root, "dist"), sourceStamp(root))).toBe(true);
  });

  it.each([
    ["a page changes", () => write("src/pages/index.astro", "<h1>Overview!</h1>")],
    ["a source file is added", () => write("src/lib/new.ts", "export {}")],
    ["a static file is added", () => write("public/robots.txt", "")],
    ["the dependencies change", () => write("package-lock.json", '{"lockfileVersion":3}')],
    ["the configuration changes", () => write("astro.config.mjs", "export default { output: 'server' }")],
  ])("asks for a new build when %s", (_what, change) => {
    build();
    change();
    expect(buildIsCurrent(join(root, "dist"), sourceStamp(root))).toBe(false);
  });

  it("does not trust a stamp without the built server", () => {
    build();
    rmSync(join(root, "dist/server"), { recursive: true });
    expect(buildIsCurrent(join(root, "dist"), sourceStamp(root))).toBe(false);
  });

  it("does not trust a build that was never stamped (an older or interrupted build)", () => {
    write("dist/server/entry.mjs", "// built");
    expect(buildIsCurrent(join(root, "dist"), sourceStamp(root))).toBe(false);
  });
});

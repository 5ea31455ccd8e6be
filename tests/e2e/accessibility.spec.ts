import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import { can, ROLES, type Permission, type Role } from "../../src/lib/permissions";
import { ROUTE_RULES } from "../integration/route-rules";
import { signIn } from "./support";

/**
 * axe-core over every page, for every role that may open it (the permissions of route-rules.ts), and
 * over the public pages signed out: no serious or critical violation of WCAG 2.1 A and AA.
 */
const EMAILS: Record<Role, string> = {
  technician: "tech@demo.test",
  manager: "manager@demo.test",
  safety: "safety@demo.test",
  client: "client@demo.test",
  admin: "admin@demo.test",
};
const PUBLIC_PAGES = ["/sign-in", "/forgot-password", "/forbidden", "/no-such-page"];

const pages = Object.entries(ROUTE_RULES)
  .filter(([file]) => file.endsWith(".astro"))
  .flatMap(([file, rule]) => {
    const access = rule.methods.GET;
    return access && "permission" in access ? [{ file, permission: access.permission, own: access.own === true }] : [];
  });

const opens = (role: Role, page: { permission: Permission; own: boolean }) =>
  can(role, page.permission) || (page.own && can(role, `${page.permission}:own` as Permission));

/** A page's path; an [id] route takes the first record its list links to (none: skipped, said). */
async function pathOf(page: Page, file: string): Promise<string | null> {
  const route = "/" + file.replace(/(\/index)?\.astro$/, "");
  if (!route.includes("[id]")) return route;
  const prefix = route.replace("/[id]", "");
  const list = prefix === "/planning/methods" ? "/planning" : prefix;
  await page.goto(list);
  const hrefs = await page.locator(`a[href^="${prefix}/"]`).evaluateAll((links) => links.map((a) => a.getAttribute("href") ?? ""));
  return hrefs.find((href) => new RegExp(`^${prefix}/\\d+$`).test(href)) ?? null;
}

async function seriousViolations(page: Page, path: string): Promise<string[]> {
  await page.goto(path);
  await page.waitForLoadState("load");
  const result = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"]).analyze();
  return result.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map(
      (v) =>
        `${path}: ${v.id} (${v.impact}) at ${v.nodes
          .map((n) => n.target.join(" "))
          .slice(0, 3)
          .join(" | ")}`,
    );
}

test.describe.configure({ timeout: 180_000 });

test("the public pages have no serious accessibility violations", async ({ page }) => {
  const found: string[] = [];
  for (const path of PUBLIC_PAGES) found.push(...(await seriousViolations(page, path)));
  expect(found).toEqual([]);
});

for (const role of ROLES) {
  test(`every page a ${role} opens has no serious accessibility violations`, async ({ page }) => {
    await signIn(page, EMAILS[role]);
    const found: string[] = [];
    const unchecked: string[] = [];
    for (const entry of pages.filter((p) => opens(role, p))) {
      const path = await pathOf(page, entry.file);
      if (!path) unchecked.push(entry.file);
      else found.push(...(await seriousViolations(page, path)));
    }
    if (unchecked.length) test.info().annotations.push({ type: "no record to open", description: unchecked.join(", ") });
    expect(found).toEqual([]);
  });
}

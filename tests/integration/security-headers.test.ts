// Security headers, cookies, uploaded files and error answers, on a private instance of the built
// app (the same build the browser tests run against; they check that islands still hydrate).
import { describe, expect, it } from "vitest";
import { useAppInstance } from "../support/app-instance";

const app = useAppInstance();

const STACK = /\n\s+at\s|node_modules|\/src\/|\.ts:\d+|\.mjs:\d+|Sequelize\w*Error|ER_[A-Z_]{4,}/;

function policy(response: Response): Map<string, string> {
  const header = response.headers.get("content-security-policy") ?? "";
  return new Map(
    header
      .split(";")
      .map((d) => d.trim())
      .filter(Boolean)
      .map((d) => [d.split(/\s+/)[0]!, d.slice(d.indexOf(" ") + 1)] as [string, string]),
  );
}

describe("pages carry a Content-Security-Policy with a per-request nonce", () => {
  it("every inline <script> and <style> Astro rendered carries the nonce; no 'unsafe-inline' or 'unsafe-eval' for scripts", async () => {
    const manager = await app.client("manager@demo.test");
    for (const path of ["/sign-in", "/home", "/batches/1", "/runs/new", "/usage"]) {
      const response = path === "/sign-in" ? await fetch(app.baseUrl + path) : await manager.fetch(path);
      expect(response.status, path).toBe(200);
      const csp = policy(response);
      const nonce = /'nonce-([A-Za-z0-9+/=]+)'/.exec(csp.get("script-src") ?? "")?.[1];
      expect(nonce, `${path}: ${response.headers.get("content-security-policy")}`).toBeTruthy();
      // 'wasm-unsafe-eval' compiles WebAssembly only (the camera's Code 128 reader), never strings as code.
      expect(csp.get("script-src")).not.toMatch(/'unsafe-inline'|'unsafe-eval'|\*/);
      expect(csp.get("style-src")).toContain(`'nonce-${nonce}'`);
      expect(csp.get("default-src")).toBe("'self'");
      expect(csp.get("object-src")).toBe("'none'");
      expect(csp.get("base-uri")).toBe("'self'");
      expect(csp.get("frame-ancestors")).toBe("'none'");
      const html = await response.text();
      const tags = [...html.matchAll(/<(script|style)\b[^>]*>/gi)].map((m) => m[0]);
      for (const tag of tags) {
        // External scripts are same-origin files ('self'); inline ones need the nonce.
        if (/\ssrc=/.test(tag)) expect(tag).toMatch(/src="\/(?!\/)/);
        else expect(tag, `${path}: ${tag}`).toContain(`nonce="${nonce}"`);
      }
      // No inline event handlers (which no nonce could allow).
      expect(html).not.toMatch(/\son(click|load|error|submit|change)=/i);
    }
  });

  it("the nonce is new on every request", async () => {
    const nonces = new Set<string>();
    for (let i = 0; i < 5; i++)
      nonces.add(/'nonce-([^']+)'/.exec((await fetch(`${app.baseUrl}/sign-in`)).headers.get("content-security-policy") ?? "")![1]!);
    expect(nonces.size).toBe(5);
  });

  it("every answer says nosniff, a referrer policy and no framing; PDFs may be framed by Decant's own pages only", async () => {
    const tech = await app.client("tech@demo.test");
    const cases = [
      { path: "/sign-in", frame: "'none'" },
      { path: "/api/health", frame: "'none'" },
      { path: "/api/batches", frame: "'none'" },
      { path: "/api/no-such-route", frame: "'none'", status: 404 },
      { path: "/no-such-page", frame: "'none'", status: 404 },
      { path: "/api/batches/1/label.pdf?disposition=inline&copies=1", frame: "'self'" },
    ];
    for (const c of cases) {
      const response = c.path === "/sign-in" ? await fetch(app.baseUrl + c.path) : await tech.fetch(c.path);
      expect(response.status, c.path).toBe(c.status ?? 200);
      expect(response.headers.get("x-content-type-options"), c.path).toBe("nosniff");
      expect(response.headers.get("referrer-policy"), c.path).toBe("strict-origin-when-cross-origin");
      // Decant's own pages may ask for the camera (the label scanner); nothing else may, and no frame.
      expect(response.headers.get("permissions-policy"), c.path).toMatch(/(^|, )camera=\(self\)(,|$)/);
      expect(policy(response).get("frame-ancestors"), c.path).toBe(c.frame);
      expect(response.headers.get("x-frame-options"), c.path).toBe(c.frame === "'self'" ? "SAMEORIGIN" : "DENY");
    }
    // An unknown /api/ path answers JSON, not the HTML 404 page.
    const missing = await tech.fetch("/api/no-such-route");
    expect(missing.headers.get("content-type")).toMatch(/^application\/json/);
    expect(((await missing.json()) as { error: string }).error).toMatch(/^path: /);
  });
});

describe("the session cookie", () => {
  const attributes = (setCookie: string) => setCookie.split(";").map((p) => p.trim().toLowerCase());

  it("is HttpOnly, SameSite=Lax and Path=/, and not Secure over plain http", async () => {
    const response = await fetch(`${app.baseUrl}/api/auth/sign-in`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ email: "safety@demo.test", password: "decant-demo" }),
    });
    expect(response.status).toBe(200);
    // The session cookie comes first; the signed device cookie follows (sign-in routes only, never cross-site).
    const [session, device] = response.headers.getSetCookie();
    const parts = attributes(session!);
    expect(attributes(device!)).toEqual(expect.arrayContaining(["httponly", "samesite=strict", "path=/api/auth"]));
    expect(attributes(device!)).not.toContain("secure");
    expect(parts[0]).toMatch(/^decant_session=\w+/);
    expect(parts).toContain("httponly");
    expect(parts).toContain("samesite=lax");
    expect(parts).toContain("path=/");
    expect(parts).not.toContain("secure");
    expect(response.headers.get("strict-transport-security")).toBeNull();
  });

  it("is Secure (and HSTS is sent) when a proxy says the browser came over https", async () => {
    const response = await fetch(`${app.baseUrl}/api/auth/sign-in`, {
      method: "POST",
      headers: { "content-type": "application/json", "x-forwarded-proto": "https" },
      body: JSON.stringify({ email: "safety@demo.test", password: "decant-demo" }),
    });
    expect(response.status).toBe(200);
    const [session, device] = response.headers.getSetCookie();
    const parts = attributes(session!);
    expect(attributes(device!)).toContain("secure");
    expect(parts).toContain("secure");
    expect(parts).toContain("httponly");
    expect(parts).toContain("samesite=lax");
    expect(response.headers.get("strict-transport-security")).toMatch(/max-age=\d{7,}/);
    const cookie = response.headers.get("set-cookie")!.split(";")[0]!;
    const out = await fetch(`${app.baseUrl}/api/auth/sign-out`, { method: "POST", headers: { cookie, "x-forwarded-proto": "https" } });
    expect(out.status).toBe(204);
    const cleared = attributes(out.headers.get("set-cookie")!);
    expect(cleared[0]).toBe("decant_session=");
    expect(cleared).toContain("secure");
    expect(cleared).toContain("httponly");
  });
});

describe("uploaded files are served as downloads, typed by their content", () => {
  it("a PNG uploaded as coa.pdf comes back as image/png, attachment, nosniff and sandboxed", async () => {
    const tech = await app.client("tech@demo.test");
    const png = Uint8Array.from([
      0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52, 0, 0, 0, 1, 0, 0, 0, 1, 8, 6, 0, 0, 0, 0x1f,
      0x15, 0xc4, 0x89,
    ]);
    const form = new FormData();
    for (const [k, v] of Object.entries({
      reagent: "water",
      lotNumber: "SEC-PNG-1",
      supplier: "Veldmoor stores",
      grade: "HPLC",
      receivedOn: "2026-11-01",
      expiresOn: "2027-11-01",
      quantity: "1000",
    }))
      form.append(k, v);
    form.append("certificate", new Blob([png], { type: "application/pdf" }), "coa.pdf");
    const created = await tech.fetch("/api/stock-lots", { method: "POST", body: form });
    expect(created.status, await created.clone().text()).toBe(201);
    const { lot } = (await created.json()) as { lot: { id: number } };
    const file = await tech.fetch(`/api/stock-lots/${lot.id}/certificate`);
    expect(file.status).toBe(200);
    expect(file.headers.get("content-type")).toBe("image/png");
    expect(file.headers.get("content-disposition")).toMatch(/^attachment; filename="/);
    expect(file.headers.get("x-content-type-options")).toBe("nosniff");
    expect(policy(file).get("default-src")).toBe("'none'");
    expect(file.headers.get("content-security-policy")).toContain("sandbox");
    expect(new Uint8Array(await file.arrayBuffer())).toEqual(png);
  });
});

describe("no answer shows a stack trace or internals", () => {
  it("bad JSON, wrong types, unknown routes, malformed URLs and bad ids answer without internals", async () => {
    const admin = await app.client("admin@demo.test");
    const probes: [string, RequestInit][] = [
      ["/api/batches", { method: "POST", headers: { "content-type": "application/json" }, body: "{" }],
      ["/api/batches", { method: "POST", headers: { "content-type": "application/json" }, body: "[".repeat(20_000) }],
      [
        "/api/rates",
        {
          method: "POST",
          headers: { "content-type": "application/json" },
          body: JSON.stringify({ kind: "reagent", amount_minor: "1e999" }),
        },
      ],
      ["/api/batches/99999999999999999999999", {}],
      ["/api/batches/1e999", {}],
      ["/api/usage?from=2026-02-30&to=2026-13-01", {}],
      ["/api/%E0%A4%A", {}],
      ["/batches/abc", {}],
      ["/batches/99999999999999999999999", {}],
      ["/api/no/such/route", { method: "DELETE" }],
      ["/api/imports?mode=commit", { method: "POST", headers: { "content-type": "text/csv" }, body: "\u0000\u0001" }],
    ];
    for (const [path, init] of probes) {
      const response = await admin.fetch(path, init);
      const text = await response.text();
      expect(response.status, `${path} → ${response.status} ${text.slice(0, 200)}`).toBeLessThan(500);
      expect(text, path).not.toMatch(STACK);
    }
  });
});

// The per-address sign-in limit cannot be dodged by sending X-Forwarded-For: the built app,
// served by scripts/serve.mjs, records the address the request really came from, and believes
// forwarded addresses only from as many proxies as TRUSTED_PROXY_HOPS says.
import { spawnSync } from "node:child_process";
import { appServerCommand } from "../../scripts/lib/app-server.mjs";
import { QueryTypes } from "sequelize";
import { describe, expect, it } from "vitest";
import { useAppInstance, type AppInstance } from "../support/app-instance";

async function wrongPassword(app: AppInstance, email: string, forwardedFor: string) {
  const r = await fetch(`${app.baseUrl}/api/auth/sign-in`, {
    method: "POST",
    headers: { "content-type": "application/json", "x-forwarded-for": forwardedFor },
    body: JSON.stringify({ email, password: "not the password" }),
  });
  return r.status;
}

async function recordedAddresses(app: AppInstance): Promise<string[]> {
  const rows = await app.sequelize.query<{ ip: string }>("SELECT ip FROM sign_in_attempts ORDER BY id", { type: QueryTypes.SELECT });
  return rows.map((r) => r.ip);
}

describe("with no trusted proxy (the default)", () => {
  const app = useAppInstance();

  it("counts failures from a rotating X-Forwarded-For against the real address, and pauses it", async () => {
    // One account from "different" addresses: the pair (account, address) is blocked after 5
    // failures, which a forged header would dodge if it were believed.
    const statuses = [];
    for (let i = 1; i <= 6; i++) statuses.push(await wrongPassword(app, "nobody@demo.test", `203.0.113.${i}`));
    expect(statuses).toEqual([401, 401, 401, 401, 401, 429]);
    expect(new Set(await recordedAddresses(app))).toEqual(new Set(["127.0.0.1"]));
  });
});

describe("behind one trusted proxy", () => {
  const app = useAppInstance({ TRUSTED_PROXY_HOPS: "1" });

  it("records the address the proxy appended, not what the client claimed before it", async () => {
    expect(await wrongPassword(app, "tech@demo.test", "6.6.6.6, 198.51.100.23")).toBe(401);
    expect(await recordedAddresses(app)).toEqual(["198.51.100.23"]);
  });
});

describe("a bad TRUSTED_PROXY_HOPS", () => {
  it("stops the server at start with a message naming the variable", () => {
    const result = spawnSync(...appServerCommand(process.env.DECANT_OUT_DIR ?? "dist"), {
      env: { ...process.env, TRUSTED_PROXY_HOPS: "all", PORT: "1" },
      encoding: "utf8",
      timeout: 20_000,
    });
    expect(result.status).toBe(1);
    expect(result.stderr).toContain('TRUSTED_PROXY_HOPS must be a whole number from 0 to 10, got "all"');
  });
});

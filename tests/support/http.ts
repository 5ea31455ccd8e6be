// Talks to the app that `npm test` started (its own database, seeded with the demo data).
export const BASE_URL = process.env.E2E_BASE_URL ?? "http://127.0.0.1:4331";
export const DEMO_PASSWORD = "decant-demo";

export interface Client {
  /** The session cookie, `decant_session=…` (tests may copy or replace it). */
  cookie: string | null;
  /** The other cookies the app set (the signed device cookies), by name. */
  others: Map<string, string>;
  fetch(path: string, init?: RequestInit): Promise<Response>;
}

const SESSION_COOKIE = "decant_session";

/** A client that keeps the cookies the app sets, as a browser would (paths aside). */
export function cookieClient(baseUrl: string): Client {
  const c: Client = {
    cookie: null,
    others: new Map(),
    async fetch(path, init = {}) {
      const headers = new Headers(init.headers);
      const sent = [c.cookie, ...[...c.others].map(([name, value]) => `${name}=${value}`)].filter(Boolean);
      if (sent.length && !headers.has("cookie")) headers.set("cookie", sent.join("; "));
      const response = await fetch(baseUrl + path, { ...init, headers, redirect: "manual" });
      for (const set of response.headers.getSetCookie()) {
        const pair = set.split(";")[0] ?? "";
        const name = pair.slice(0, pair.indexOf("="));
        const value = pair.slice(pair.indexOf("=") + 1);
        if (name === SESSION_COOKIE) c.cookie = pair;
        else if (value) c.others.set(name, value);
        else c.others.delete(name);
      }
      return response;
    },
  };
  return c;
}

/** A cookie-keeping client; signed in when an e-mail is given. */
export async function client(email?: string, password = DEMO_PASSWORD): Promise<Client> {
  const c = cookieClient(BASE_URL);
  if (email) {
    const response = await c.fetch("/api/auth/sign-in", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ email, password }),
    });
    if (response.status !== 200) throw new Error(`sign-in as ${email} answered ${response.status}`);
  }
  return c;
}

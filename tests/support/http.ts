// Talks to the app that `npm test` started (its own database, seeded with the demo data).
export const BASE_URL = process.env.E2E_BASE_URL ?? "http://127.0.0.1:4331";
export const DEMO_PASSWORD = "decant-demo";

export interface Client {
  cookie: string | null;
  fetch(path: string, init?: RequestInit): Promise<Response>;
}

/** A cookie-keeping client; signed in when an e-mail is given. */
export async function client(email?: string, password = DEMO_PASSWORD): Promise<Client> {
  const c: Client = {
    cookie: null,
    async fetch(path, init = {}) {
      const headers = new Headers(init.headers);
      if (c.cookie) headers.set("cookie", c.cookie);
      const response = await fetch(BASE_URL + path, { ...init, headers, redirect: "manual" });
      const set = response.headers.get("set-cookie");
      if (set) c.cookie = set.split(";")[0] ?? null;
      return response;
    },
  };
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

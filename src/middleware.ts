import { randomBytes } from "node:crypto";
import { defineMiddleware, sequence } from "astro:middleware";
import { clearSessionCookie } from "./lib/server/auth/cookies";
import { lucia } from "./lib/server/auth/lucia";
import { validateSession } from "./lib/server/auth/sessions";
import { getSequelize } from "./lib/server/db";
import { startSchedules } from "./lib/server/scheduler";
import { errorResponse, json } from "./lib/server/http";
import { contentSecurityPolicy, addNonces, requestIsHttps, STATIC_SECURITY_HEADERS } from "./lib/server/security-headers";

const STATE_CHANGING = new Set(["POST", "PUT", "PATCH", "DELETE"]);

/**
 * Every answer, pages, API routes and the refusals below alike, carries the security headers.
 * Pages get a Content-Security-Policy with a fresh nonce: Astro's island runtime is an inline
 * `<script>` (and a one-line inline `<style>`), so each `<script>`/`<style>` element Astro rendered
 * gets the nonce and nothing injected later can run. PDFs may be framed by Decant's own pages
 * (the label preview on a batch page); everything else may be framed by no one.
 */
const securityHeaders = defineMiddleware(async (context, next) => {
  let response = await next();
  // An /api/ path that matches no route (or whose parameter Astro cannot match) answers JSON, not the 404 page.
  if (
    response.status === 404 &&
    context.url.pathname.startsWith("/api/") &&
    (response.headers.get("content-type") ?? "").startsWith("text/html")
  ) {
    response = json({ error: "path: no such API route" }, 404);
  }
  const type = (response.headers.get("content-type") ?? "").toLowerCase();
  const isHtml = type.startsWith("text/html");
  const isPdf = type.startsWith("application/pdf");
  // The dev server injects styles and scripts from JavaScript; the policy applies to built apps.
  const enforce = !import.meta.env.DEV;
  const nonce = isHtml ? randomBytes(16).toString("base64") : null;
  if (nonce && enforce && response.body) {
    const html = addNonces(await response.text(), nonce);
    response = new Response(html, { status: response.status, statusText: response.statusText, headers: new Headers(response.headers) });
  }
  const headers: Record<string, string> = { ...STATIC_SECURITY_HEADERS };
  if (enforce) headers["content-security-policy"] = contentSecurityPolicy({ nonce, frameAncestors: isPdf ? "'self'" : "'none'" });
  headers["x-frame-options"] = isPdf ? "SAMEORIGIN" : "DENY";
  if (requestIsHttps(context.request, context.url)) headers["strict-transport-security"] = "max-age=31536000; includeSubDomains";
  // A route's own policy (a stricter one for uploaded files) stays, with frame-ancestors added.
  const own = response.headers.get("content-security-policy");
  if (own) headers["content-security-policy"] = /frame-ancestors/.test(own) ? own : `${own}; frame-ancestors 'none'`;
  const apply = (target: Headers) => {
    for (const [name, value] of Object.entries(headers))
      if (name === "content-security-policy" || !target.has(name)) target.set(name, value);
  };
  try {
    apply(response.headers);
  } catch {
    // Immutable headers (a Response.redirect): copy the answer once.
    response = new Response(response.body, {
      status: response.status,
      statusText: response.statusText,
      headers: new Headers(response.headers),
    });
    apply(response.headers);
  }
  return response;
});

/**
 * Refuses state-changing requests, forms and JSON alike, whose Origin is another site. A browser
 * always sends Origin on a cross-site POST; tools that send none are not browsers carrying a
 * victim's cookie. Webhooks come from the payments provider and are verified by signature instead.
 */
const sameOrigin = defineMiddleware(({ request, url }, next) => {
  if (STATE_CHANGING.has(request.method) && !url.pathname.startsWith("/api/webhooks/")) {
    const origin = request.headers.get("origin");
    const host = request.headers.get("x-forwarded-host") ?? request.headers.get("host");
    let originHost: string | null = null;
    try {
      originHost = origin && origin !== "null" ? new URL(origin).host : origin;
    } catch {
      originHost = "invalid";
    }
    if (originHost !== null && originHost !== host) {
      return url.pathname.startsWith("/api/")
        ? json({ error: "Cross-site requests are not accepted." }, 403)
        : new Response("Cross-site form submissions are not accepted.", { status: 403 });
    }
  }
  return next();
});

/**
 * Puts the signed-in user and session on locals (a half-finished sign-in on `signInStep` only);
 * clears the cookie of a session that has ended (idle or absolute limit, sessions.ts).
 */
const session = defineMiddleware(async (context, next) => {
  getSequelize(); // binds the models on the first request
  startSchedules();
  context.locals.user = null;
  context.locals.session = null;
  context.locals.signInStep = null;
  const sessionId = context.cookies.get(lucia.sessionCookieName)?.value ?? null;
  if (sessionId) {
    try {
      const found = await validateSession(sessionId);
      if (!found) clearSessionCookie(context.cookies, context.url, context.request);
      else if (found.session.stage === "signed-in") {
        context.locals.session = found.session;
        context.locals.user = found.user;
      } else context.locals.signInStep = found;
    } catch (error) {
      // The database is down: health still answers; everything else says 503.
      if (context.url.pathname !== "/api/health") return errorResponse(error);
    }
  }
  return next();
});

export const onRequest = sequence(securityHeaders, sameOrigin, session);

import { defineMiddleware, sequence } from "astro:middleware";
import { clearSessionCookie, setSessionCookie } from "./lib/server/auth/cookies";
import { lucia } from "./lib/server/auth/lucia";
import { getSequelize } from "./lib/server/db";
import { errorResponse, json } from "./lib/server/http";

const STATE_CHANGING = new Set(["POST", "PUT", "PATCH", "DELETE"]);

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

/** Puts the signed-in user and session on locals; renews or clears the cookie as lucia says. */
const session = defineMiddleware(async (context, next) => {
  getSequelize(); // binds the models on the first request
  context.locals.user = null;
  context.locals.session = null;
  const sessionId = context.cookies.get(lucia.sessionCookieName)?.value ?? null;
  if (sessionId) {
    try {
      const { session, user } = await lucia.validateSession(sessionId);
      if (session?.fresh) setSessionCookie(context.cookies, lucia.createSessionCookie(session.id), context.url);
      if (!session) clearSessionCookie(context.cookies, context.url);
      context.locals.session = session;
      context.locals.user = user;
    } catch (error) {
      // The database is down: health still answers; everything else says 503.
      if (context.url.pathname !== "/api/health") return errorResponse(error);
    }
  }
  return next();
});

export const onRequest = sequence(sameOrigin, session);

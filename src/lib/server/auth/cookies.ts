import type { AstroCookies } from "astro";
import type { Cookie } from "lucia";
import { requestIsHttps } from "../security-headers";
import { lucia } from "./lucia";

/**
 * Sets a lucia cookie: HttpOnly, SameSite=Lax, and Secure whenever the browser came over https
 * (directly or, with `request`, through a proxy that sends X-Forwarded-Proto: https).
 */
export function setSessionCookie(cookies: AstroCookies, cookie: Cookie, url: URL, request?: Request) {
  const secure = request ? requestIsHttps(request, url) : url.protocol === "https:";
  cookies.set(cookie.name, cookie.value, { ...cookie.attributes, httpOnly: true, sameSite: "lax", secure });
}

export function setSessionCookieFor(cookies: AstroCookies, sessionId: string, url: URL, request?: Request) {
  setSessionCookie(cookies, lucia.createSessionCookie(sessionId), url, request);
}

export function clearSessionCookie(cookies: AstroCookies, url: URL, request?: Request) {
  setSessionCookie(cookies, lucia.createBlankSessionCookie(), url, request);
}

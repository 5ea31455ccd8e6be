import type { AstroCookies } from "astro";
import type { Cookie } from "lucia";
import { requestIsHttps } from "../security-headers";
import { DEVICE_COOKIE_MAX_AGE_S, DEVICE_COOKIE_PATH } from "./device-cookie";
import { lucia } from "./lucia";

/**
 * Sets a lucia cookie: HttpOnly, SameSite=Lax, and Secure whenever the browser came over https
 * (directly or, with `request`, through a proxy that sends X-Forwarded-Proto: https).
 */
export function setSessionCookie(cookies: AstroCookies, cookie: Cookie, url: URL, request?: Request) {
  const secure = request ? requestIsHttps(request, url) : url.protocol === "https:";
  cookies.set(cookie.name, cookie.value, { ...cookie.attributes, httpOnly: true, sameSite: "lax", secure });
}

/** On a shared bench computer the cookie lasts only while the browser is open (no Max-Age). */
export function setSessionCookieFor(
  cookies: AstroCookies,
  sessionId: string,
  url: URL,
  request?: Request,
  options: { sharedBench?: boolean } = {},
) {
  const cookie = lucia.createSessionCookie(sessionId);
  if (options.sharedBench) delete cookie.attributes.maxAge;
  setSessionCookie(cookies, cookie, url, request);
}

/** The signed device cookie: sent to the sign-in routes only, never cross-site. */
export function setDeviceCookie(cookies: AstroCookies, device: { name: string; value: string }, url: URL, request?: Request) {
  cookies.set(device.name, device.value, {
    path: DEVICE_COOKIE_PATH,
    maxAge: DEVICE_COOKIE_MAX_AGE_S,
    httpOnly: true,
    sameSite: "strict",
    secure: request ? requestIsHttps(request, url) : url.protocol === "https:",
  });
}

export function clearSessionCookie(cookies: AstroCookies, url: URL, request?: Request) {
  setSessionCookie(cookies, lucia.createBlankSessionCookie(), url, request);
}

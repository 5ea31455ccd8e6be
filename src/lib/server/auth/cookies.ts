import type { AstroCookies } from "astro";
import type { Cookie } from "lucia";
import { lucia } from "./lucia";

/** Sets a lucia cookie; Secure whenever the request came over https. */
export function setSessionCookie(cookies: AstroCookies, cookie: Cookie, url: URL) {
  cookies.set(cookie.name, cookie.value, { ...cookie.attributes, httpOnly: true, secure: url.protocol === "https:" });
}

export function setSessionCookieFor(cookies: AstroCookies, sessionId: string, url: URL) {
  setSessionCookie(cookies, lucia.createSessionCookie(sessionId), url);
}

export function clearSessionCookie(cookies: AstroCookies, url: URL) {
  setSessionCookie(cookies, lucia.createBlankSessionCookie(), url);
}

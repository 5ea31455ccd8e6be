/**
 * The security headers every answer carries, and the Content-Security-Policy of pages. Pure: the
 * middleware (src/middleware.ts) applies them; tests/integration/security-headers.test.ts checks
 * them on the running app.
 */

/** Sent on every answer unless the route set its own value. */
export const STATIC_SECURITY_HEADERS: Readonly<Record<string, string>> = {
  "x-content-type-options": "nosniff",
  "referrer-policy": "strict-origin-when-cross-origin",
  "cross-origin-opener-policy": "same-origin",
  "permissions-policy": "camera=(self), microphone=(), geolocation=(), payment=()",
};

/**
 * The policy. Scripts: Decant's own files and the inline elements Astro rendered for this answer
 * (they carry the nonce); no eval, no inline event handlers; WebAssembly compiled from Decant's own
 * files (`'wasm-unsafe-eval'`: the camera scanner's Code 128 reader). Styles: own files and nonced
 * elements; `style` attributes stay allowed (`style-src-attr`) because server-rendered bars and
 * chart keys set a width or a colour inline, which cannot run code. Frames: Decant's own pages
 * (the PDF label preview); `frameAncestors` is `'none'` except for PDFs, which Decant's pages frame.
 */
export function contentSecurityPolicy(options: { nonce: string | null; frameAncestors: "'none'" | "'self'" }): string {
  const nonce = options.nonce ? ` 'nonce-${options.nonce}'` : "";
  return [
    "default-src 'self'",
    `script-src 'self' 'wasm-unsafe-eval'${nonce}`,
    `style-src 'self'${nonce}`,
    "style-src-attr 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "frame-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    `frame-ancestors ${options.frameAncestors}`,
  ].join("; ");
}

/**
 * Gives every `<script>` and `<style>` element of a rendered page the nonce. Text a user typed is
 * HTML-escaped by Astro before it reaches this point, so only elements Astro rendered match.
 */
export function addNonces(html: string, nonce: string): string {
  return html.replace(/<(script|style)(?=[\s>])/gi, (_all, tag: string) => `<${tag} nonce="${nonce}"`);
}

/**
 * True when the browser reached Decant over https: directly, or through a proxy that says so in
 * X-Forwarded-Proto. The forwarded header is trusted for one purpose only, making cookies Secure
 * (and sending HSTS): a forged "https" can only make a cookie stricter, never weaker, so it needs
 * no list of trusted proxies (Astro's `security.allowedDomains`).
 */
export function requestIsHttps(request: Request, url: URL): boolean {
  if (url.protocol === "https:") return true;
  const forwarded = request.headers.get("x-forwarded-proto")?.split(",")[0]?.trim().toLowerCase();
  return forwarded === "https";
}

// TOTP against the published test vectors, and the QR code drawn for the authenticator app decoded back.
import { decodeBase32IgnorePadding } from "@oslojs/encoding";
import { generateHOTP } from "@oslojs/otp";
import jsQR from "jsqr";
import { describe, expect, it } from "vitest";
import { describeBrowser } from "../../../src/lib/auth/user-agent";
import { qrPath, totpStep } from "../../../src/lib/server/auth/two-factor";

// RFC 6238 Appendix B, SHA-1 rows: the key is the ASCII "12345678901234567890", 30-second steps, 8 digits.
const RFC_KEY = new TextEncoder().encode("12345678901234567890");
describe("RFC 6238 test vectors (Appendix B, SHA-1)", () => {
  it.each([
    [59, "94287082"],
    [1111111109, "07081804"],
    [1111111111, "14050471"],
    [1234567890, "89005924"],
    [2000000000, "69279037"],
    [20000000000, "65353130"],
  ])("T = %i s → %s", (seconds, code) => {
    const step = totpStep(new Date(seconds * 1000));
    expect(generateHOTP(RFC_KEY, BigInt(step), 8)).toBe(code);
    // Decant uses 6 digits: the same truncation, modulo 10^6 (RFC 4226 §5.3), so the last six digits.
    expect(generateHOTP(RFC_KEY, BigInt(step), 6)).toBe(code.slice(2));
  });
});

/** Paints the path's unit squares (as drawn in the browser) into a bitmap jsQR can read. */
function render(qr: { size: number; path: string }, scale = 6, margin = 4) {
  const side = (qr.size + 2 * margin) * scale;
  const pixels = new Uint8ClampedArray(side * side * 4).fill(255);
  for (const m of qr.path.matchAll(/M(\d+) (\d+)h(\d+)v1h-\d+z/g)) {
    const [x, y, w] = [Number(m[1]), Number(m[2]), Number(m[3])];
    for (let py = (y + margin) * scale; py < (y + margin + 1) * scale; py++)
      for (let px = (x + margin) * scale; px < (x + margin + w) * scale; px++) pixels.set([0, 0, 0, 255], (py * side + px) * 4);
  }
  return { pixels, side };
}

describe("the QR code for the authenticator app", () => {
  it("decodes to the otpauth:// address with the account, the issuer and the secret", () => {
    const secret = "JBSWY3DPEHPK3PXPJBSWY3DPEHPK3PXP";
    const uri = `otpauth://totp/Decant:rowan.ellery%40lab.test?issuer=Decant&algorithm=SHA1&secret=${secret}&period=30&digits=6`;
    const qr = qrPath(uri);
    expect(qr.size).toBeGreaterThanOrEqual(21);
    const { pixels, side } = render(qr);
    const decoded = jsQR(pixels, side, side);
    expect(decoded?.data).toBe(uri);
    expect(decodeBase32IgnorePadding(secret)).toHaveLength(20);
  });
});

describe("describeBrowser", () => {
  it.each([
    ["Mozilla/5.0 (Windows NT 10.0; Win64; x64; rv:133.0) Gecko/20100101 Firefox/133.0", "Firefox on Windows"],
    ["Mozilla/5.0 (X11; Linux x86_64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/131.0.0.0 Safari/537.36", "Chrome on Linux"],
    [
      "Mozilla/5.0 (Windows NT 10.0; Win64; x64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/131.0.0.0 Safari/537.36 Edg/131.0.0.0",
      "Edge on Windows",
    ],
    [
      "Mozilla/5.0 (iPhone; CPU iPhone OS 17_5 like Mac OS X) AppleWebKit/605.1.15 (KHTML, like Gecko) Version/17.5 Mobile/15E148 Safari/604.1",
      "Safari on iOS",
    ],
    ["Mozilla/5.0 (Linux; Android 14) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/131.0.0.0 Mobile Safari/537.36", "Chrome on Android"],
    [null, "Unknown browser"],
  ])("%s → %s", (ua, text) => expect(describeBrowser(ua)).toBe(text));
});

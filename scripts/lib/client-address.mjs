// Which address a request comes from, for the per-address sign-in limit and the audit log.
//
// Astro takes the first X-Forwarded-For entry as the client address, and anyone can send that
// header. Only the entries added by proxies Decant trusts mean anything: each such proxy appends
// the address it was reached from, so the client is the entry `hops` places from the end of the
// chain (the chain ending in the address of the socket itself). With no trusted proxy the socket's
// own address is the only one that counts.

/** Reads TRUSTED_PROXY_HOPS: how many reverse proxies of the facility's own stand before Decant (0 to 10). */
export function trustedProxyHops(value) {
  if (value === undefined || value === "") return 0;
  if (!/^\d+$/.test(value) || Number(value) > 10)
    throw new Error(`TRUSTED_PROXY_HOPS must be a whole number from 0 to 10, got "${value}".`);
  return Number(value);
}

/**
 * The client's address given the X-Forwarded-For header (a string, an array of header lines, or
 * undefined), the socket's remote address and the number of trusted proxies.
 *
 * @example clientAddress("198.51.100.7, 10.0.0.2", "127.0.0.1", 1) // → "10.0.0.2": the one proxy saw 10.0.0.2
 * @example clientAddress("198.51.100.7", "127.0.0.1", 0)           // → "127.0.0.1": the header is ignored
 */
export function clientAddress(forwardedFor, socketAddress, hops) {
  const header = Array.isArray(forwardedFor) ? forwardedFor.join(",") : (forwardedFor ?? "");
  const chain = header
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean);
  chain.push(socketAddress ?? "");
  // Fewer entries than trusted hops: the first proxy itself was reached directly, so its first entry is all there is.
  return chain[Math.max(0, chain.length - 1 - hops)] || socketAddress || "";
}

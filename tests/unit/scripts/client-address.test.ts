// Which address the per-address sign-in limit counts: only the X-Forwarded-For entries that the
// facility's own proxies appended are believed (scripts/lib/client-address.mjs).
import { describe, expect, it } from "vitest";
import { clientAddress, trustedProxyHops } from "../../../scripts/lib/client-address.mjs";

describe("clientAddress", () => {
  it.each([
    // No trusted proxy: whatever the header says, the socket is the client.
    { header: undefined, socket: "192.0.2.10", hops: 0, expected: "192.0.2.10" },
    { header: "203.0.113.5", socket: "192.0.2.10", hops: 0, expected: "192.0.2.10" },
    { header: "203.0.113.5, 198.51.100.9", socket: "192.0.2.10", hops: 0, expected: "192.0.2.10" },
    // One proxy (on 127.0.0.1) appended the address it was reached from; earlier entries are the client's own claims.
    { header: "203.0.113.5", socket: "127.0.0.1", hops: 1, expected: "203.0.113.5" },
    { header: "6.6.6.6, 203.0.113.5", socket: "127.0.0.1", hops: 1, expected: "203.0.113.5" },
    // Two proxies: the outer one appended the client, the inner one the outer proxy's address.
    { header: "6.6.6.6, 203.0.113.5, 10.0.0.2", socket: "127.0.0.1", hops: 2, expected: "203.0.113.5" },
    // A proxy that sends no header (or a request that reached the app directly) leaves the socket.
    { header: undefined, socket: "127.0.0.1", hops: 1, expected: "127.0.0.1" },
    // Fewer entries than hops: the first entry is all there is.
    { header: "203.0.113.5", socket: "127.0.0.1", hops: 3, expected: "203.0.113.5" },
    // Several header lines count as one comma-separated list; blanks are dropped.
    { header: ["6.6.6.6", " 203.0.113.5 ,"], socket: "127.0.0.1", hops: 1, expected: "203.0.113.5" },
    { header: "2001:db8::7", socket: "::1", hops: 1, expected: "2001:db8::7" },
  ])("$header via $socket with $hops trusted hop(s) → $expected", ({ header, socket, hops, expected }) => {
    expect(clientAddress(header, socket, hops)).toBe(expected);
  });
});

describe("trustedProxyHops", () => {
  it.each([
    [undefined, 0],
    ["", 0],
    ["0", 0],
    ["1", 1],
    ["10", 10],
  ])("reads %j as %d", (value, hops) => {
    expect(trustedProxyHops(value)).toBe(hops);
  });
  it.each(["-1", "1.5", "two", "11", " 1"])("refuses %j with a message naming the variable", (value) => {
    expect(() => trustedProxyHops(value)).toThrow(/TRUSTED_PROXY_HOPS must be a whole number from 0 to 10/);
  });
});

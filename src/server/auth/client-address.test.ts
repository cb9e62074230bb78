// Which hop of X-Forwarded-For is the client (common practice: MDN's X-Forwarded-For page —
// "the right-most IP address not added by a trusted proxy" — from memory).
import { describe, it, expect } from "vitest";
import { proxyMatcher, resolveClientAddress, PEER_HEADER } from "./client-address";

const h = (o: Record<string, string>) => new Headers(o);

describe("resolveClientAddress", () => {
  const none = proxyMatcher([]);
  const proxies = proxyMatcher(["10.0.0.0/8", "192.0.2.1", "fd00::/8"]);

  it("takes the peer and ignores X-Forwarded-For when no proxy is trusted", () => {
    expect(resolveClientAddress(h({ [PEER_HEADER]: "198.51.100.7", "x-forwarded-for": "1.2.3.4" }), none)).toBe(
      "198.51.100.7",
    );
  });

  it("ignores a rotating X-Forwarded-For from an untrusted peer", () => {
    const seen = new Set(
      [1, 2, 3].map((i) =>
        resolveClientAddress(h({ [PEER_HEADER]: "198.51.100.7", "x-forwarded-for": `203.0.113.${i}` }), proxies),
      ),
    );
    expect([...seen]).toEqual(["198.51.100.7"]);
  });

  it("behind trusted proxies, takes the right-most hop that is not one of them", () => {
    const hdr = h({ [PEER_HEADER]: "10.1.2.3", "x-forwarded-for": "6.6.6.6, 198.51.100.9, 192.0.2.1" });
    expect(resolveClientAddress(hdr, proxies)).toBe("198.51.100.9");
  });

  it("normalises IPv4-mapped IPv6 peers and matches IPv6 ranges", () => {
    expect(
      resolveClientAddress(h({ [PEER_HEADER]: "::ffff:10.0.0.5", "x-forwarded-for": "198.51.100.1" }), proxies),
    ).toBe("198.51.100.1");
    expect(resolveClientAddress(h({ [PEER_HEADER]: "fd12::1", "x-forwarded-for": "2001:db8::5" }), proxies)).toBe(
      "2001:db8::5",
    );
  });

  it("without a peer header uses the right-most X-Forwarded-For entry (what next start writes)", () => {
    expect(resolveClientAddress(h({ "x-forwarded-for": "6.6.6.6, 198.51.100.4" }), none)).toBe("198.51.100.4");
    expect(resolveClientAddress(h({}), none)).toBe("unknown");
  });

  it("refuses a TRUSTED_PROXIES entry that is not an address", () => {
    expect(() => proxyMatcher(["example.com"])).toThrow(/TRUSTED_PROXIES/);
  });
});

import "server-only";
import net from "node:net";

/**
 * The request header that carries the TCP peer's address. `next start` gives route handlers and
 * actions no socket, and sets X-Forwarded-For to the peer only when the client sent none (so a
 * client-sent value would hide the peer); src/instrumentation.ts therefore stamps this header on
 * every request from the socket itself, overwriting whatever a client sent under that name.
 */
export const PEER_HEADER = "x-inhibitrack-peer";

/** "::ffff:10.0.0.1" (an IPv4 peer on a dual-stack socket) → "10.0.0.1"; anything else unchanged. */
export function normaliseAddress(a: string): string {
  const t = a.trim().replace(/^\[(.*)\]$/, "$1");
  const m = /^::ffff:(\d{1,3}(?:\.\d{1,3}){3})$/i.exec(t);
  return (m ? m[1]! : t).toLowerCase();
}

/** A matcher for the configured proxies (addresses or CIDR ranges), built on node:net's BlockList. */
export function proxyMatcher(entries: string[]): (address: string) => boolean {
  const list = new net.BlockList();
  for (const e of entries) {
    const [addr, bits] = e.split("/");
    const a = normaliseAddress(addr!);
    const type = net.isIPv6(a) ? "ipv6" : "ipv4";
    if (!net.isIP(a)) throw new Error(`TRUSTED_PROXIES: "${e}" is not an IP address or CIDR range`);
    if (bits === undefined) list.addAddress(a, type);
    else list.addSubnet(a, Number(bits), type);
  }
  return (address) => {
    const a = normaliseAddress(address);
    const type = net.isIPv6(a) ? "ipv6" : net.isIPv4(a) ? "ipv4" : null;
    return type !== null && list.check(a, type);
  };
}

/**
 * The client's address: the peer, unless the peer is a trusted proxy; then X-Forwarded-For is read
 * from the right and the first hop that is not a trusted proxy is the client (hops further left
 * were written by the client and prove nothing). Without a peer (the instrumentation hook did not
 * run, e.g. in tests) the right-most X-Forwarded-For entry stands in for it: that is the value
 * `next start` itself writes when the client sent none.
 */
export function resolveClientAddress(
  h: { get(name: string): string | null },
  isTrusted: (address: string) => boolean,
): string {
  const forwarded = (h.get("x-forwarded-for") ?? "")
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean)
    .map(normaliseAddress);
  const peerHeader = h.get(PEER_HEADER);
  const peer = peerHeader ? normaliseAddress(peerHeader) : forwarded.pop();
  if (!peer) return "unknown";
  let client = peer;
  while (isTrusted(client) && forwarded.length > 0) client = forwarded.pop()!;
  return client;
}

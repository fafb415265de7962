/**
 * The real client address of a request. Proxy headers (X-Forwarded-For, X-Real-IP) are client-controlled unless a
 * proxy in front rewrites them, so they are trusted only when LITHODEX_TRUSTED_PROXY_HOPS says how many proxies
 * append to X-Forwarded-For; otherwise the TCP peer address is used, which instrumentation.ts stamps on every request
 * as `x-lithodex-peer` (overwriting anything a client sent under that name).
 */

export const PEER_HEADER = "x-lithodex-peer";

/** Number of trusted proxies in front of the app (env LITHODEX_TRUSTED_PROXY_HOPS, default 0: trust no header). */
export function trustedProxyHops(env: Record<string, string | undefined> = process.env): number {
  const n = Number(env.LITHODEX_TRUSTED_PROXY_HOPS ?? 0);
  return Number.isInteger(n) && n > 0 ? Math.min(n, 10) : 0;
}

/**
 * @param headers - request headers
 * @param hops - trusted proxies: the address is the hops-th entry from the right of X-Forwarded-For
 *   (each trusted proxy appends the address it saw; entries further left are client-written)
 * @returns an address string, or "unknown"
 */
export function clientAddress(headers: Headers, hops: number = trustedProxyHops()): string {
  if (hops > 0) {
    const xff = (headers.get("x-forwarded-for") ?? "")
      .split(",")
      .map((s) => s.trim())
      .filter(Boolean);
    const v = xff[xff.length - hops];
    if (v) return normalise(v);
  }
  const peer = headers.get(PEER_HEADER);
  return peer ? normalise(peer) : "unknown";
}

/** "::ffff:1.2.3.4" → "1.2.3.4"; IPv6 addresses are keyed on their /64 (one host usually owns the whole /64). */
export function normalise(addr: string): string {
  const a = addr.trim().toLowerCase();
  const v4 = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/.exec(a);
  if (v4) return v4[1];
  if (a.includes(":")) {
    const full = expandIpv6(a);
    return full ? `${full.slice(0, 4).join(":")}::/64` : a;
  }
  return a;
}

function expandIpv6(a: string): string[] | null {
  const [head, tail] = a.split("::");
  const h = head ? head.split(":") : [];
  const t = tail !== undefined ? (tail ? tail.split(":") : []) : [];
  if (tail === undefined && h.length !== 8) return null;
  const fill = 8 - h.length - t.length;
  if (fill < 0) return null;
  return [...h, ...Array(tail !== undefined ? fill : 0).fill("0"), ...t].map((x) => x.padStart(4, "0"));
}

/**
 * Cross-site request check for state-changing requests (OWASP CSRF Prevention Cheat Sheet, "Verifying origin with
 * standard headers"): a browser sends Origin on every POST/PUT/PATCH/DELETE, so a request whose Origin is neither this
 * site nor one listed in TRUSTED_ORIGINS is refused. Requests without Origin (curl, scripts, server-to-server) carry
 * no ambient browser credentials of a victim and pass, unless Sec-Fetch-Site says the browser saw a cross-site request.
 */

export const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/** Origins from TRUSTED_ORIGINS (comma-separated) plus BETTER_AUTH_URL's origin. */
export function trustedOrigins(env: Record<string, string | undefined> = process.env): Set<string> {
  const out = new Set<string>();
  const list = [...(env.TRUSTED_ORIGINS || "http://localhost:3000,http://127.0.0.1:3000").split(","), env.BETTER_AUTH_URL ?? ""];
  for (const raw of list) {
    const v = raw.trim();
    if (!v) continue;
    try {
      out.add(new URL(v).origin);
    } catch {
      // ignore malformed entries
    }
  }
  return out;
}

export interface OriginVerdict {
  ok: boolean;
  reason?: string;
}

/**
 * @param method - request method
 * @param headers - request headers (Origin, Sec-Fetch-Site, Host)
 * @param selfOrigin - this server's origin as the request addressed it (scheme + Host)
 * @param trusted - extra allowed origins
 */
export function checkOrigin(method: string, headers: Headers, selfOrigin: string, trusted: Set<string> = trustedOrigins()): OriginVerdict {
  if (SAFE_METHODS.has(method.toUpperCase())) return { ok: true };
  const origin = headers.get("origin");
  if (origin === null) {
    if (headers.get("sec-fetch-site") === "cross-site") return { ok: false, reason: "The browser marked this request as cross-site." };
    return { ok: true };
  }
  if (origin === "null") return { ok: false, reason: "Requests from an opaque origin are refused." };
  let o: string;
  try {
    o = new URL(origin).origin;
  } catch {
    return { ok: false, reason: "The Origin header is not a URL." };
  }
  if (o === selfOrigin || trusted.has(o)) return { ok: true };
  return { ok: false, reason: `Requests from ${o} are not allowed; only this site and TRUSTED_ORIGINS may change data.` };
}

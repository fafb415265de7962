import { NextResponse, type NextRequest } from "next/server";
import { trustedProxyHops } from "@/lib/security/client-address";
import { API_CSP, HSTS, makeNonce, pageCsp } from "@/lib/security/headers";
import { checkOrigin } from "@/lib/security/origin";

/** Served over HTTPS: the request URL says so, or a trusted proxy's X-Forwarded-Proto does. */
function isHttps(request: NextRequest): boolean {
  if (request.nextUrl.protocol === "https:") return true;
  return trustedProxyHops() > 0 && request.headers.get("x-forwarded-proto")?.split(",")[0].trim() === "https";
}

/**
 * Runs before every page and API route: refuses state-changing API requests from other sites (Origin check), and
 * sets the Content-Security-Policy with a fresh nonce (pages), HSTS over HTTPS. The headers that never change are
 * set for every path, static files included, in next.config.mjs.
 */
export function proxy(request: NextRequest) {
  const path = request.nextUrl.pathname;
  const https = isHttps(request);
  if (path.startsWith("/api/")) {
    const verdict = checkOrigin(request.method, request.headers, request.nextUrl.origin);
    const res = verdict.ok
      ? NextResponse.next()
      : NextResponse.json({ error: { code: "forbidden", message: verdict.reason ?? "Cross-site request refused." } }, { status: 403 });
    res.headers.set("Content-Security-Policy", API_CSP);
    if (https) res.headers.set("Strict-Transport-Security", HSTS);
    return res;
  }
  const nonce = makeNonce();
  const csp = pageCsp(nonce, { dev: process.env.NODE_ENV === "development", https });
  const requestHeaders = new Headers(request.headers);
  requestHeaders.set("x-nonce", nonce);
  requestHeaders.set("Content-Security-Policy", csp);
  const res = NextResponse.next({ request: { headers: requestHeaders } });
  res.headers.set("Content-Security-Policy", csp);
  if (https) res.headers.set("Strict-Transport-Security", HSTS);
  return res;
}

export const config = {
  matcher: [
    {
      source: "/((?!_next/static|_next/image|favicon.ico|icon.svg|leaflet/|tiles-offline/).*)",
      missing: [
        { type: "header", key: "next-router-prefetch" },
        { type: "header", key: "purpose", value: "prefetch" },
      ],
    },
  ],
};

import { NextResponse, type NextRequest } from "next/server";
import { trustedProxyHops } from "@/lib/security/client-address";
import { HSTS, makeNonce, pageCsp } from "@/lib/security/headers";

/**
 * Served over HTTPS: `next start` speaks plain HTTP, so TLS ends at a proxy in front; its X-Forwarded-Proto is
 * believed only when LITHODEX_TRUSTED_PROXY_HOPS says there is one (a client could send the header itself).
 */
function isHttps(request: NextRequest): boolean {
  return trustedProxyHops() > 0 && request.headers.get("x-forwarded-proto")?.split(",")[0].trim() === "https";
}

/**
 * Runs before every page: sets the Content-Security-Policy with a fresh nonce (Next puts it on its scripts) and HSTS
 * over HTTPS. API routes are left out on purpose: with a proxy Next buffers request bodies in memory (and cuts them at
 * proxyClientMaxBodySize), which would undo the streamed body limits; API routes check Origin themselves
 * (lib/api/handler.ts) and get their fixed headers from next.config.mjs.
 */
export function proxy(request: NextRequest) {
  const https = isHttps(request);
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
      source: "/((?!api/|_next/static|_next/image|favicon.ico|icon.svg|leaflet/|tiles-offline/).*)",
      missing: [
        { type: "header", key: "next-router-prefetch" },
        { type: "header", key: "purpose", value: "prefetch" },
      ],
    },
  ],
};

/**
 * Security headers for every response (OWASP Secure Headers Project recommendations; CSP with per-request nonces as
 * the Next.js 16 guide "Content Security Policy" describes). Pure: no framework imports.
 */

/** Page CSP: scripts only with this request's nonce ('strict-dynamic' lets them load their chunks). */
export function pageCsp(nonce: string, opts: { dev?: boolean; https?: boolean } = {}): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${opts.dev ? " 'unsafe-eval'" : ""}`,
    // Leaflet positions tiles and markers with inline style attributes, React renders style props as attributes:
    // styles stay 'unsafe-inline' (a nonce here would switch 'unsafe-inline' off for them).
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' blob: data:",
    "font-src 'self'",
    "connect-src 'self'",
    "worker-src 'self' blob:",
    "manifest-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    ...(opts.https ? ["upgrade-insecure-requests"] : []),
  ].join("; ");
}

/** API and file responses render nothing: no sources at all, never framed. */
export const API_CSP = "default-src 'none'; frame-ancestors 'none'; sandbox";

/** Headers that are the same on every response. */
export const STATIC_SECURITY_HEADERS: Record<string, string> = {
  "X-Content-Type-Options": "nosniff",
  "Referrer-Policy": "strict-origin-when-cross-origin",
  "X-Frame-Options": "DENY",
  // The field screens use the device position and the camera (photos); nothing else.
  "Permissions-Policy": "geolocation=(self), camera=(self), microphone=(), payment=(), usb=(), serial=(), bluetooth=(), interest-cohort=()",
  "Cross-Origin-Opener-Policy": "same-origin",
};

/** HSTS for responses served over HTTPS (two years; RFC 6797). */
export const HSTS = "max-age=63072000; includeSubDomains";

/** A random nonce, base64 of 16 random bytes (the guide uses a UUID's bytes; the same entropy). */
export function makeNonce(): string {
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  return btoa(String.fromCharCode(...bytes));
}

/** Headers that never change, on every response (static files included); CSP and HSTS come from proxy.ts. */
const securityHeaders = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Permissions-Policy", value: "geolocation=(self), camera=(self), microphone=(), payment=(), usb=(), serial=(), bluetooth=(), interest-cohort=()" },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
];

/** @type {import('next').NextConfig} */
const nextConfig = {
  // exifr loads fs/zlib dynamically, pdfkit reads its font metrics and piscina starts its worker file from their own folders: bundling breaks them.
  serverExternalPackages: ["exifr", "file-type", "pdfkit", "piscina"],
  poweredByHeader: false,
  async headers() {
    return [
      { source: "/:path*", headers: securityHeaders },
      // API answers render nothing: no sources, never framed (pages get a nonce CSP from proxy.ts).
      { source: "/api/:path*", headers: [{ key: "Content-Security-Policy", value: "default-src 'none'; frame-ancestors 'none'; sandbox" }] },
    ];
  },
  // A separate build folder lets browser tests build beside a running dev server.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  // The build type-checks too (CI also runs `npm run typecheck`).
  typescript: { ignoreBuildErrors: false },
};

export default nextConfig;

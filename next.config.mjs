/** @type {import('next').NextConfig} */
const nextConfig = {
  // exifr loads fs/zlib dynamically, pdfkit reads its font metrics and piscina starts its worker file from their own folders: bundling breaks them.
  serverExternalPackages: ["exifr", "pdfkit", "piscina"],
  poweredByHeader: false,
  // A separate build folder lets browser tests build beside a running dev server.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  // Types are checked by `npm run typecheck` (CI runs it); the build does not repeat it.
  typescript: { ignoreBuildErrors: true },
};

export default nextConfig;

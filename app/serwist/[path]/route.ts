import { spawnSync } from "node:child_process";
import { createSerwistRoute } from "@serwist/turbopack";

// Serves the service worker built from lib/pwa/sw.ts at /serwist/sw.js (static, made at build time).
const dist = (process.env.NEXT_DIST_DIR || ".next").replace(/\/$/, "");
// Revision of the precached manifest: the commit built (a new build re-fetches it).
const revision = spawnSync("git", ["rev-parse", "HEAD"], { encoding: "utf-8" }).stdout?.trim() || crypto.randomUUID();

export const { dynamic, dynamicParams, revalidate, generateStaticParams, GET } = createSerwistRoute({
  swSrc: "lib/pwa/sw.ts",
  useNativeEsbuild: true,
  // Built assets and small public files; the 22 MB offline basemap is cached tile by tile at runtime instead.
  globPatterns: [`${dist}/static/**/*.{js,css,woff2,svg,png,ico,json}`, "public/leaflet/**/*", "public/icons/**/*"],
  additionalPrecacheEntries: [{ url: "/manifest.webmanifest", revision }],
  maximumFileSizeToCacheInBytes: 8 * 1024 * 1024,
});

import type { MetadataRoute } from "next";

/** Web app manifest (W3C "Web Application Manifest"): installable, opens on the project list, standalone. */
export default function manifest(): MetadataRoute.Manifest {
  return {
    name: "Lithodex",
    short_name: "Lithodex",
    description: "Field samples, lab XRD scans and mineral phases, from outcrop to report.",
    id: "/",
    start_url: "/projects",
    scope: "/",
    display: "standalone",
    orientation: "any",
    background_color: "#f6f4ef",
    theme_color: "#1d5c63",
    icons: [
      { src: "/icons/icon-192.png", sizes: "192x192", type: "image/png", purpose: "any" },
      { src: "/icons/icon-512.png", sizes: "512x512", type: "image/png", purpose: "any" },
      { src: "/icons/icon-maskable-512.png", sizes: "512x512", type: "image/png", purpose: "maskable" },
    ],
  };
}

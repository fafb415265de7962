import type { Metadata, Viewport } from "next";
import localFont from "next/font/local";
import { connection } from "next/server";
import { Providers } from "./providers";
import "./globals.css";

const inter = localFont({
  src: [
    { path: "./fonts/inter-latin-400-normal.woff2", weight: "400", style: "normal" },
    { path: "./fonts/inter-latin-500-normal.woff2", weight: "500", style: "normal" },
    { path: "./fonts/inter-latin-600-normal.woff2", weight: "600", style: "normal" },
    { path: "./fonts/inter-latin-700-normal.woff2", weight: "700", style: "normal" },
  ],
  variable: "--font-inter",
  display: "swap",
});

export const metadata: Metadata = {
  title: { default: "Lithodex", template: "%s · Lithodex" },
  description: "Field samples, lab XRD scans and mineral phases, from outcrop to report.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#1d5c63" };

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // Every page renders per request so that Next can put the CSP nonce from proxy.ts on its scripts.
  await connection();
  return (
    <html lang="en" className={inter.variable}>
      <body className="min-h-screen font-sans antialiased">
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}

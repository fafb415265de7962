"use client";

import "./globals.css";

/** Last-resort boundary (the root layout itself failed): its own <html>, no app providers. */
export default function GlobalError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <html lang="en">
      <body className="min-h-screen font-sans antialiased">
        <main id="main" className="mx-auto flex min-h-[60vh] max-w-xl flex-col justify-center px-4 py-16">
          <p className="text-sm font-semibold tracking-wide text-brand">Lithodex · error</p>
          <h1 className="mt-2 text-2xl font-semibold text-ink">Lithodex could not start this page</h1>
          <p className="mt-3 text-sm text-muted">Try again in a moment. Saved records are not affected.</p>
          {error.digest && <p className="mt-2 text-sm text-muted">Reference for your administrator: <code>{error.digest}</code></p>}
          <div className="mt-6 flex gap-3">
            <button type="button" onClick={reset} className="rounded-md bg-brand px-3 py-2 text-sm font-medium text-white">
              Try again
            </button>
            {/* A full page load, not client navigation: the app shell may be what failed. */}
            {/* eslint-disable-next-line @next/next/no-html-link-for-pages */}
            <a href="/projects" className="rounded-md border px-3 py-2 text-sm font-medium underline">
              Back to your projects
            </a>
          </div>
        </main>
      </body>
    </html>
  );
}

import Link from "next/link";

/** A full-page message with a way back (404 and error boundaries). No data fetching: it must render when nothing else does. */
export function StatusPage({ code, title, children, actions }: { code: string; title: string; children?: React.ReactNode; actions?: React.ReactNode }) {
  return (
    <main id="main" className="mx-auto flex min-h-[60vh] max-w-xl flex-col justify-center px-4 py-16">
      <p className="text-sm font-semibold tracking-wide text-brand">Lithodex · {code}</p>
      <h1 className="mt-2 text-2xl font-semibold text-ink">{title}</h1>
      <div className="mt-3 space-y-2 text-sm text-muted">{children}</div>
      <div className="mt-6 flex flex-wrap gap-3">
        {actions}
        <Link href="/projects" className="rounded-md border border-line bg-white px-3 py-2 text-sm font-medium text-ink underline-offset-2 hover:underline">
          Back to your projects
        </Link>
      </div>
    </main>
  );
}

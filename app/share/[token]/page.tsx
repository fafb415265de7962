import type { Metadata } from "next";
import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { ExportMenu } from "@/components/phase-map/export-menu";
import { PhaseChip } from "@/components/phase-map/phase-chip";
import { Logo } from "@/components/ui/logo";
import { AppError } from "@/lib/dal/errors";
import { getSharedRegister } from "@/lib/dal/share-links";
import { ASBESTOS_CAVEAT, CONFIRMED_VS_CANDIDATE, IDENTIFICATION_CAVEAT, describeFilter, hasAsbestiformPhase } from "@/lib/export";
import { formatDate, formatLatLon } from "@/lib/format";

export const metadata: Metadata = { title: "Shared sample register", robots: { index: false, follow: false }, referrer: "no-referrer" };

/** A read-only register shared by a project lead: no account needed; revoked or expired links answer 410. */
export default async function SharedRegisterPage({ params, searchParams }: { params: Promise<{ token: string }>; searchParams: Promise<{ page?: string }> }) {
  const { token } = await params;
  const { page } = await searchParams;
  let data: Awaited<ReturnType<typeof getSharedRegister>>;
  try {
    data = await getSharedRegister(token, page);
  } catch (err) {
    if (err instanceof AppError && err.code === "not_found") notFound();
    // A page cannot answer 410 itself; the gone route does, with the reason.
    if (err instanceof AppError && err.code === "gone") redirect(`/share/${encodeURIComponent(token)}/gone`);
    throw err;
  }
  const pages = Math.max(1, Math.ceil(data.total / data.pageSize));
  const asbestos = data.rows.some((r) => hasAsbestiformPhase({ confirmed: r.phases.confirmed, candidates: r.phases.candidates }));
  const pageHref = (p: number) => `/share/${encodeURIComponent(token)}?page=${p}`;
  return (
    <div className="mx-auto max-w-7xl space-y-4 px-4 py-6">
      <header className="flex flex-wrap items-center justify-between gap-3">
        <Logo />
        <p className="text-sm text-muted">Read-only shared register · no account needed</p>
      </header>
      <section className="rounded-lg border border-line bg-white p-4 shadow-sm">
        <h1 className="text-2xl font-semibold">{data.project.name}</h1>
        <p className="text-sm text-muted">
          {data.project.code}
          {data.project.region ? ` · ${data.project.region}` : ""}
          {data.link.label ? ` · ${data.link.label}` : ""}
        </p>
        <dl className="mt-2 grid gap-x-6 gap-y-1 text-sm sm:grid-cols-3">
          <div>
            <dt className="inline text-muted">Selection: </dt>
            <dd className="inline" data-testid="share-filter">{describeFilter(data.filter)}</dd>
          </div>
          <div>
            <dt className="inline text-muted">Samples: </dt>
            <dd className="inline" data-testid="share-total">{data.total}</dd>
          </div>
          <div>
            <dt className="inline text-muted">Link valid until: </dt>
            <dd className="inline">{data.link.expiresAt.toISOString().slice(0, 16).replace("T", " ")} UTC</dd>
          </div>
        </dl>
        <ExportMenu className="mt-3" base={`/api/share/${encodeURIComponent(token)}/export`} query="" />
      </section>
      <p role="note" className="rounded-md border border-oxide/30 bg-oxide-light px-3 py-2 text-sm">
        <strong>Limits of automated identification.</strong> {IDENTIFICATION_CAVEAT} {CONFIRMED_VS_CANDIDATE}
      </p>
      {asbestos && (
        <p role="alert" className="rounded-md border border-danger/30 bg-red-50 px-3 py-2 text-sm text-danger">
          <strong>Caution (a confirmed or candidate phase on this page):</strong> {ASBESTOS_CAVEAT}
        </p>
      )}
      <div className="overflow-x-auto rounded-lg border border-line bg-white">
        <table className="w-full min-w-[760px] text-sm">
          <caption className="sr-only">Shared samples with confirmed phases and unconfirmed candidates</caption>
          <thead className="bg-stone text-left text-xs uppercase tracking-wide text-muted">
            <tr>
              <th className="px-3 py-2 font-medium">Code</th>
              <th className="px-3 py-2 font-medium">Station</th>
              <th className="px-3 py-2 font-medium">Type</th>
              <th className="px-3 py-2 font-medium">Lithology</th>
              <th className="px-3 py-2 font-medium">Collected</th>
              <th className="px-3 py-2 font-medium">Position (WGS84)</th>
              <th className="px-3 py-2 font-medium">Confirmed phases</th>
              <th className="px-3 py-2 font-medium">Candidates (unconfirmed)</th>
            </tr>
          </thead>
          <tbody>
            {data.rows.map((r) => (
              <tr key={r.code} className="border-t border-line align-top" data-testid="share-row">
                <td className="px-3 py-2 font-medium whitespace-nowrap">{r.code}</td>
                <td className="px-3 py-2 whitespace-nowrap">{r.stationCode ?? "—"}</td>
                <td className="px-3 py-2">{r.sampleType.replace(/_/g, " ")}</td>
                <td className="px-3 py-2">{r.lithology ?? "—"}</td>
                <td className="px-3 py-2 whitespace-nowrap">{formatDate(r.collectedAt)}</td>
                <td className="px-3 py-2 whitespace-nowrap">{formatLatLon(r.lat, r.lon)}</td>
                <td className="px-3 py-2">
                  <span className="flex flex-wrap gap-1">
                    {r.phases.confirmed.length ? r.phases.confirmed.map((p) => <PhaseChip key={p.mineral} mineral={p.mineral} group={p.group} kind="confirmed" wtPercent={p.wtPercent} />) : <span className="text-muted">—</span>}
                  </span>
                </td>
                <td className="px-3 py-2">
                  <span className="flex flex-wrap gap-1">
                    {r.phases.candidates.length ? r.phases.candidates.map((p) => <PhaseChip key={p.mineral} mineral={p.mineral} group={p.group} kind="candidate" />) : <span className="text-muted">—</span>}
                  </span>
                </td>
              </tr>
            ))}
            {data.rows.length === 0 && (
              <tr>
                <td colSpan={8} className="px-3 py-8 text-center text-muted">
                  No samples match this selection.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      {pages > 1 && (
        <nav aria-label="Pages" className="flex items-center justify-end gap-3 text-sm">
          {data.page > 1 && <Link href={pageHref(data.page - 1)}>Previous</Link>}
          <span>
            Page {data.page} of {pages}
          </span>
          {data.page < pages && <Link href={pageHref(data.page + 1)}>Next</Link>}
        </nav>
      )}
    </div>
  );
}

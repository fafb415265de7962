import type { Metadata } from "next";
import { headers } from "next/headers";
import { notFound, redirect } from "next/navigation";
import { LabIntakeForm, LabScanUpload } from "@/components/lab-link/lab-actions";
import { ASBESTOS_SAMPLE_NOTE, LabSafetyNotes } from "@/components/submissions/lab-cautions";
import { Logo } from "@/components/ui/logo";
import { formatDateTime } from "@/lib/dates";
import { authorize, getActor } from "@/lib/dal/actor";
import { AppError } from "@/lib/dal/errors";
import { getLabView, labLinkProject } from "@/lib/dal/lab-links";
import { SAMPLE_TYPE_LABELS } from "@/lib/format";

export const metadata: Metadata = { title: "Lab submission", robots: { index: false, follow: false }, referrer: "no-referrer" };

const INTAKE: Record<string, string> = { received: "Received", damaged: "Damaged", missing: "Missing", extra: "Extra" };

/**
 * An outside lab's page for one submission, opened from the dispatch e-mail without an account: the manifest, the
 * intake, then a scan upload per sample — nothing else of the project. A signed-in member of the project is sent to
 * the submission's own page (a lab with an account uses its role).
 */
export default async function LabLinkPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const actor = await getActor(await headers());
  if (actor) {
    const memberPage = await labLinkProject(token);
    if (memberPage) {
      const member = await authorize(actor, memberPage.split("/")[2], "project.read").then(
        () => true,
        () => false,
      );
      if (member) redirect(memberPage);
    }
  }
  let data: Awaited<ReturnType<typeof getLabView>>;
  try {
    data = await getLabView(token);
  } catch (err) {
    if (err instanceof AppError && err.code === "not_found") notFound();
    if (err instanceof AppError && err.code === "gone") redirect(`/lab/${encodeURIComponent(token)}/gone`);
    throw err;
  }
  const zone = data.project.timeZone;
  const s = data.submission;
  const samples = data.samples.map((x) => ({ ...x, typeLabel: SAMPLE_TYPE_LABELS[x.sampleType] }));
  const flagged = samples.filter((x) => x.suspectedAsbestos).map((x) => x.code);
  return (
    <div className="mx-auto max-w-5xl space-y-4 px-4 py-6">
      <header className="flex flex-wrap items-center justify-between gap-3">
        <Logo />
        <p className="text-sm text-muted">Lab link · no account needed · valid until {formatDateTime(data.link.expiresAt, zone)}</p>
      </header>
      <section className="rounded-lg border border-line bg-white p-4 shadow-sm">
        <p className="text-xs uppercase tracking-wide text-muted">Sample submission for your lab</p>
        <h1 className="text-2xl font-semibold" data-testid="lab-submission-code">
          {s.code}
        </h1>
        <p className="text-sm text-muted">
          {data.project.name} ({data.project.code}) · sent by {s.createdByName ?? "the project team"}
          {s.sentAt ? ` on ${formatDateTime(s.sentAt, zone)}` : ""}
        </p>
        <dl className="mt-2 grid gap-x-6 gap-y-1 text-sm sm:grid-cols-2">
          <div>
            <dt className="inline text-muted">Requested analysis: </dt>
            <dd className="inline">{s.requestedAnalysis}</dd>
          </div>
          <div>
            <dt className="inline text-muted">Priority: </dt>
            <dd className="inline">{s.priority}</dd>
          </div>
          <div>
            <dt className="inline text-muted">Waybill: </dt>
            <dd className="inline">{s.waybill ?? "—"}</dd>
          </div>
          <div>
            <dt className="inline text-muted">Status: </dt>
            <dd className="inline" data-testid="lab-status">
              {s.status === "sent" ? "On its way to your lab" : s.receivedAt ? `Received ${formatDateTime(s.receivedAt, zone)}${s.labReference ? ` (batch ${s.labReference})` : ""}` : s.status}
            </dd>
          </div>
          {s.qaqcNote && (
            <div className="sm:col-span-2">
              <dt className="inline text-muted">QA/QC: </dt>
              <dd className="inline">{s.qaqcNote}</dd>
            </div>
          )}
          {s.notes && (
            <div className="sm:col-span-2">
              <dt className="inline text-muted">Notes: </dt>
              <dd className="inline whitespace-pre-line">{s.notes}</dd>
            </div>
          )}
        </dl>
        <a className="mt-3 inline-block text-sm font-medium text-brand hover:underline" href={`/api/lab/${encodeURIComponent(token)}/manifest`}>
          Download the manifest (PDF)
        </a>
      </section>
      {(s.hazards || flagged.length > 0) && (
        <div role="alert" className="rounded-md border border-danger/40 bg-red-50 px-3 py-2 text-sm text-danger">
          <p className="font-semibold">Hazards: {s.hazards ?? `Suspected asbestos: ${flagged.join(", ")}`}</p>
          {flagged.length > 0 && <p className="mt-1">{ASBESTOS_SAMPLE_NOTE}</p>}
        </div>
      )}
      <LabSafetyNotes />
      {data.canReceive ? (
        <section className="rounded-lg border border-line bg-white p-4 shadow-sm">
          <h2 className="mb-2 font-semibold">Record the intake</h2>
          <p className="mb-3 text-sm text-muted">When the shipment arrives, check each bag against the manifest. The project team gets a receipt by e-mail.</p>
          <LabIntakeForm token={token} samples={samples} />
        </section>
      ) : (
        <section className="rounded-lg border border-line bg-white p-4 shadow-sm">
          <h2 className="mb-2 font-semibold">Bags on the manifest</h2>
          <table className="w-full text-sm">
            <thead className="text-left text-xs uppercase tracking-wide text-muted">
              <tr>
                <th className="py-1 pr-3 font-medium">Sample</th>
                <th className="py-1 pr-3 font-medium">Type</th>
                <th className="py-1 pr-3 font-medium">Weight</th>
                <th className="py-1 pr-3 font-medium">Intake</th>
                <th className="py-1 pr-3 font-medium">Scans</th>
              </tr>
            </thead>
            <tbody>
              {samples.map((x) => (
                <tr key={x.id} className="border-t border-line" data-testid="lab-sample-row">
                  <td className="py-1.5 pr-3 font-mono font-medium">{x.code}</td>
                  <td className="py-1.5 pr-3">{x.typeLabel}</td>
                  <td className="py-1.5 pr-3">{x.weightKg != null ? `${x.weightKg} kg` : "—"}</td>
                  <td className="py-1.5 pr-3">{x.intakeCondition ? INTAKE[x.intakeCondition] : "—"}</td>
                  <td className="py-1.5 pr-3">{x.scans.length ? x.scans.map((sc) => sc.originalName).join(", ") : "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      )}
      {data.canUpload && (
        <section className="rounded-lg border border-line bg-white p-4 shadow-sm">
          <h2 className="mb-2 font-semibold">Upload scans</h2>
          <p className="mb-3 text-sm text-muted">One XRD scan file per sample (XY, CSV and the other formats Lithodex reads). The project&apos;s analysts process and review them; results are not shown here.</p>
          <LabScanUpload token={token} samples={samples} />
        </section>
      )}
      <p className="text-xs text-muted">This page shows one submission only. Keep the link within the lab; the project team can withdraw it at any time.</p>
    </div>
  );
}

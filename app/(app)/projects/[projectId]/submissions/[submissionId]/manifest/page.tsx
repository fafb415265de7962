import type { Metadata } from "next";
import Link from "next/link";
import { PrintButton } from "@/components/submissions/print-button";
import { PRIORITY_LABELS, formatInstant } from "@/components/submissions/labels";
import { ASBESTOS_SAMPLE_NOTE, SILICA_NOTE } from "@/components/submissions/lab-cautions";
import { currentActor, orNotFound } from "@/lib/dal/session";
import { getSubmissionOrThrow } from "@/lib/dal/submissions";
import { SAMPLE_TYPE_LABELS } from "@/lib/format";

export const metadata: Metadata = { title: "Packing list" };

function SignatureBlock({ title }: { title: string }) {
  return (
    <div className="break-inside-avoid space-y-3 rounded border border-line p-3 print:border-black">
      <p className="text-sm font-semibold">{title}</p>
      {["Name", "Date and time", "Signature"].map((l) => (
        <div key={l} className="flex items-end gap-2 text-xs">
          <span className="w-24 shrink-0 text-muted print:text-black">{l}</span>
          <span className="h-6 flex-1 border-b border-ink" />
        </div>
      ))}
    </div>
  );
}

/** Printable packing list / manifest: goes in the sack and with the courier. */
export default async function ManifestPage({ params }: { params: Promise<{ projectId: string; submissionId: string }> }) {
  const { projectId, submissionId } = await params;
  const actor = await currentActor();
  const d = await orNotFound(getSubmissionOrThrow(actor, projectId, submissionId));
  const listed = d.samples.filter((s) => s.intakeCondition !== "extra");
  const flagged = listed.filter((s) => s.suspectedAsbestos).map((s) => s.code);
  const seals = [...new Set(d.events.filter((e) => e.event === "dispatched" && e.sealNumber).map((e) => e.sealNumber!))];
  const total = listed.reduce((sum, s) => sum + (s.weightKg ?? 0), 0);
  return (
    <article className="mx-auto max-w-4xl space-y-4 bg-white p-6 text-ink shadow-sm print:max-w-none print:p-0 print:shadow-none" aria-label="Packing list">
      <div className="no-print flex items-center justify-between gap-2">
        <Link href={`/projects/${projectId}/submissions/${d.id}`} className="text-sm text-brand hover:underline">
          ← Back to {d.code}
        </Link>
        <PrintButton />
      </div>
      <header className="flex flex-wrap items-start justify-between gap-4 border-b-2 border-ink pb-3">
        <div>
          <p className="text-xs uppercase tracking-wide text-muted print:text-black">Sample submission — packing list and chain-of-custody form</p>
          <h1 className="text-2xl font-bold">{d.code}</h1>
          <p className="text-sm">
            {d.project.name} ({d.project.code})
          </p>
        </div>
        <dl className="grid grid-cols-[auto_1fr] gap-x-3 text-sm">
          <dt className="text-muted print:text-black">Lab</dt>
          <dd>{d.labEmail ?? "—"}</dd>
          <dt className="text-muted print:text-black">Analysis</dt>
          <dd>{d.requestedAnalysis}</dd>
          <dt className="text-muted print:text-black">Priority</dt>
          <dd>{PRIORITY_LABELS[d.priority]}</dd>
          <dt className="text-muted print:text-black">Waybill</dt>
          <dd>{d.waybill ?? "________________"}</dd>
          <dt className="text-muted print:text-black">Prepared by</dt>
          <dd>{d.createdByName ?? "—"}</dd>
          <dt className="text-muted print:text-black">Printed</dt>
          <dd>{formatInstant(new Date())}</dd>
        </dl>
      </header>

      {(d.hazards || flagged.length > 0) && (
        <section className="break-inside-avoid rounded border-2 border-danger p-3 text-sm print:border-black">
          <h2 className="font-bold text-danger print:text-black">Hazards</h2>
          {d.hazards && <p className="whitespace-pre-line">{d.hazards}</p>}
          {flagged.length > 0 && <p className="mt-1 text-xs">{ASBESTOS_SAMPLE_NOTE}</p>}
        </section>
      )}

      <table className="w-full border-collapse text-sm">
        <thead>
          <tr className="border-b-2 border-ink text-left">
            <th className="py-1 pr-2">#</th>
            <th className="py-1 pr-2">Sample</th>
            <th className="py-1 pr-2">Type</th>
            <th className="py-1 pr-2">Station</th>
            <th className="py-1 pr-2 text-right">Weight</th>
            <th className="py-1 pr-2">Hazard</th>
            <th className="py-1 pr-2">Lab check</th>
          </tr>
        </thead>
        <tbody>
          {listed.map((s, i) => (
            <tr key={s.id} className="break-inside-avoid border-b border-line print:border-black/40">
              <td className="py-1 pr-2 tabular-nums">{i + 1}</td>
              <td className="py-1 pr-2 font-mono font-semibold">{s.code}</td>
              <td className="py-1 pr-2">{SAMPLE_TYPE_LABELS[s.sampleType]}</td>
              <td className="py-1 pr-2">{s.stationCode ?? "—"}</td>
              <td className="py-1 pr-2 text-right tabular-nums">{s.weightKg != null ? `${s.weightKg.toFixed(2)} kg` : "—"}</td>
              <td className="py-1 pr-2 font-semibold text-danger print:text-black">{s.suspectedAsbestos ? "SUSPECTED ASBESTOS" : ""}</td>
              <td className="py-1 pr-2">☐</td>
            </tr>
          ))}
        </tbody>
        <tfoot>
          <tr>
            <td colSpan={4} className="py-1 pr-2 text-right font-semibold">
              {listed.length} bags, approx.
            </td>
            <td className="py-1 pr-2 text-right font-semibold tabular-nums">{total.toFixed(2)} kg</td>
            <td colSpan={2} />
          </tr>
        </tfoot>
      </table>

      <section className="text-sm">
        <h2 className="font-semibold">QA/QC</h2>
        <p>{d.qaqcNote ?? "No QA/QC samples declared on this submission."}</p>
        <p className="text-xs text-muted print:text-black">QA/QC samples are inserted blind and are listed above like any other sample.</p>
        {d.notes && (
          <>
            <h2 className="mt-2 font-semibold">Notes</h2>
            <p className="whitespace-pre-line">{d.notes}</p>
          </>
        )}
      </section>

      <section className="grid gap-3 sm:grid-cols-3 print:grid-cols-3">
        <SignatureBlock title="Dispatched by (field)" />
        <SignatureBlock title="Courier" />
        <SignatureBlock title="Received by (lab)" />
      </section>
      <p className="text-xs text-muted print:text-black">
        Seal / tamper-tag numbers: {seals.length ? seals.join(", ") : "______________________"} · Condition on receipt: ______________________ · Lab batch: ______________
      </p>
      <p className="text-[11px] text-muted print:text-black">{SILICA_NOTE} Follow local regulations and your lab&apos;s accredited procedures.</p>
    </article>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { LabLinkPanel } from "@/components/submissions/lab-link-panel";
import { SubmissionActions } from "@/components/submissions/submission-actions";
import { CUSTODY_EVENT_LABELS, INTAKE_LABELS, PRIORITY_LABELS, SUBMISSION_STATUS_LABELS, formatInstant } from "@/components/submissions/labels";
import { AsbestosBanner, LabSafetyNotes } from "@/components/submissions/lab-cautions";
import { Badge } from "@/components/ui/badge";
import { buttonClass } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { listLabLinks } from "@/lib/dal/lab-links";
import { roleAllows } from "@/lib/dal/permissions";
import { recordTitle } from "@/lib/dal/record-titles";
import { currentActor, orNotFound } from "@/lib/dal/session";
import { getSubmissionOrThrow, type SubmissionDetail } from "@/lib/dal/submissions";
import { SAMPLE_STATUS_LABELS, SAMPLE_TYPE_LABELS } from "@/lib/format";
import type { CustodyEvent } from "@/lib/custody";
import type { IntakeCondition } from "@/lib/vocabulary";

/** The record in the title (e.g. "Sample APR-000123 · Lithodex"); a plain title when it is not visible. */
export async function generateMetadata({ params }: { params: Promise<{ projectId: string; submissionId: string }> }): Promise<Metadata> {
  const { projectId, submissionId } = await params;
  return { title: (await recordTitle(await currentActor(), projectId, "submission", submissionId)) ?? "Submission" };
}

function Row({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="grid grid-cols-3 gap-2 border-t border-line py-1.5 first:border-0">
      <dt className="text-sm text-muted">{label}</dt>
      <dd className="col-span-2 whitespace-pre-line text-sm">{children || "—"}</dd>
    </div>
  );
}

type EventRow = SubmissionDetail["events"][number];

/** One log row per step taken together (same step, time, person, place, seal, note), listing its samples. */
function groupEvents(events: EventRow[], codeOf: Map<string, string>) {
  const groups = new Map<string, { key: string; e: EventRow; codes: string[] }>();
  for (const e of events) {
    const key = [e.event, e.occurredAt, e.actorName, e.location, e.handedTo, e.sealNumber, e.waybill, e.condition, e.note, e.weightKg].join("|");
    const g = groups.get(key) ?? { key, e, codes: [] };
    g.codes.push(codeOf.get(e.sampleId) ?? "?");
    groups.set(key, g);
  }
  return [...groups.values()].map((g) => ({ ...g, codes: g.codes.sort() }));
}

export default async function SubmissionPage({ params }: { params: Promise<{ projectId: string; submissionId: string }> }) {
  const { projectId, submissionId } = await params;
  const actor = await currentActor();
  const d = await orNotFound(getSubmissionOrThrow(actor, projectId, submissionId));
  const can = (p: Parameters<typeof roleAllows>[1]) => actor.isAdmin || roleAllows(d.role, p);
  const codeOf = new Map(d.samples.map((s) => [s.id, s.code]));
  const labLinks = d.status !== "draft" && can("submission.write") ? await listLabLinks(actor, projectId, submissionId) : [];
  const flagged = d.samples.filter((s) => s.suspectedAsbestos).map((s) => s.code);
  return (
    <div className="space-y-4">
      <nav className="text-sm text-muted">
        <Link href={`/projects/${projectId}/submissions`} className="hover:underline">
          Submissions
        </Link>{" "}
        / {d.code}
      </nav>
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold" data-testid="submission-code">
          {d.code}
        </h1>
        <Badge tone={d.status === "reported" ? "ok" : d.status === "draft" ? "neutral" : "brand"}>{SUBMISSION_STATUS_LABELS[d.status]}</Badge>
        {d.priority !== "routine" && <Badge tone="oxide">{PRIORITY_LABELS[d.priority]} priority</Badge>}
        <Link href={`/projects/${projectId}/submissions/${d.id}/manifest`} className={buttonClass("secondary", "ml-auto")}>
          Packing list / manifest
        </Link>
        <a href={`/api/projects/${projectId}/submissions/${d.id}/manifest`} className={buttonClass("ghost")}>
          Manifest PDF
        </a>
      </div>
      <AsbestosBanner codes={flagged} />
      <div className="grid gap-4 lg:grid-cols-2">
        <Card>
          <h2 className="mb-2 font-semibold">Request</h2>
          <dl>
            <Row label="Requested analysis">{d.requestedAnalysis}</Row>
            <Row label="Samples">{d.samples.length}</Row>
            <Row label="Hazards">{d.hazards}</Row>
            <Row label="QA/QC">{d.qaqcNote}</Row>
            <Row label="Notes">{d.notes}</Row>
            <Row label="Lab e-mail">{d.labEmail}</Row>
            <Row label="Created by">{d.createdByName}</Row>
          </dl>
        </Card>
        <Card>
          <h2 className="mb-2 font-semibold">Shipment and receipt</h2>
          <dl>
            <Row label="Sent">{d.sentAt ? formatInstant(d.sentAt, d.project.timeZone) : null}</Row>
            <Row label="Waybill">{d.waybill}</Row>
            <Row label="Received">{d.receivedAt ? formatInstant(d.receivedAt, d.project.timeZone) : null}</Row>
            <Row label="Lab batch">{d.labReference}</Row>
            <Row label="Signed off">{d.reportedAt ? formatInstant(d.reportedAt, d.project.timeZone) : null}</Row>
          </dl>
        </Card>
      </div>

      <SubmissionActions
        projectId={projectId}
        submission={{ id: d.id, code: d.code, status: d.status, viewerSent: d.sentBy === actor.userId }}
        samples={d.samples.map((s) => ({ id: s.id, code: s.code, status: s.status, intakeCondition: s.intakeCondition, suspectedAsbestos: s.suspectedAsbestos }))}
        can={{ send: can("submission.write"), lab: can("lab.intake"), handOver: can("custody.write") }}
      />
      {d.status !== "draft" && can("submission.write") && (
        <Card>
          <LabLinkPanel projectId={projectId} submissionId={d.id} links={labLinks} zone={d.project.timeZone} />
        </Card>
      )}
      {d.status !== "draft" && <LabSafetyNotes />}

      <Card>
        <h2 className="mb-2 font-semibold">Samples</h2>
        <div className="overflow-x-auto">
          <table className="w-full min-w-[640px] text-sm">
            <thead className="text-left text-xs uppercase tracking-wide text-muted">
              <tr>
                <th className="py-1 pr-3 font-medium">Sample</th>
                <th className="py-1 pr-3 font-medium">Type</th>
                <th className="py-1 pr-3 font-medium">Weight</th>
                <th className="py-1 pr-3 font-medium">Intake</th>
                <th className="py-1 pr-3 font-medium">Status</th>
                <th className="py-1 pr-3 font-medium">Location</th>
              </tr>
            </thead>
            <tbody>
              {d.samples.map((s) => (
                <tr key={s.id} className="border-t border-line">
                  <td className="py-1.5 pr-3">
                    <Link href={`/projects/${projectId}/samples/${s.id}`} className="font-medium text-brand hover:underline">
                      {s.code}
                    </Link>
                    {s.suspectedAsbestos && (
                      <Badge tone="danger" className="ml-2">
                        Suspected asbestos
                      </Badge>
                    )}
                  </td>
                  <td className="py-1.5 pr-3">{SAMPLE_TYPE_LABELS[s.sampleType]}</td>
                  <td className="py-1.5 pr-3">{s.weightKg != null ? `${s.weightKg} kg` : "—"}</td>
                  <td className="py-1.5 pr-3">
                    {s.intakeCondition ? <Badge tone={s.intakeCondition === "received" ? "ok" : "danger"}>{INTAKE_LABELS[s.intakeCondition as IntakeCondition]}</Badge> : "—"}
                  </td>
                  <td className="py-1.5 pr-3">{SAMPLE_STATUS_LABELS[s.status]}</td>
                  <td className="py-1.5 pr-3">{s.storageLocation ?? "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Card>

      <Card>
        <h2 className="mb-2 font-semibold">Custody log of this submission</h2>
        {d.events.length === 0 ? (
          <p className="text-sm text-muted">Nothing recorded yet.</p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full min-w-[720px] text-sm">
              <thead className="text-left text-xs uppercase tracking-wide text-muted">
                <tr>
                  <th className="py-1 pr-3 font-medium">When</th>
                  <th className="py-1 pr-3 font-medium">Samples</th>
                  <th className="py-1 pr-3 font-medium">Step</th>
                  <th className="py-1 pr-3 font-medium">By</th>
                  <th className="py-1 pr-3 font-medium">Where</th>
                  <th className="py-1 pr-3 font-medium">Seal / waybill</th>
                  <th className="py-1 pr-3 font-medium">Note</th>
                </tr>
              </thead>
              <tbody>
                {groupEvents(d.events, codeOf).map((g) => (
                  <tr key={g.key} className="border-t border-line align-top">
                    <td className="whitespace-nowrap py-1.5 pr-3">{formatInstant(g.e.occurredAt, d.project.timeZone)}</td>
                    <td className="py-1.5 pr-3">{g.codes.join(", ")}</td>
                    <td className="py-1.5 pr-3">
                      {CUSTODY_EVENT_LABELS[g.e.event as CustodyEvent]}
                      {g.e.condition && g.e.condition !== "received" && <span className="text-danger"> ({g.e.condition})</span>}
                    </td>
                    <td className="py-1.5 pr-3">{g.e.actorName ?? "—"}</td>
                    <td className="py-1.5 pr-3">{[g.e.location, g.e.handedTo && `→ ${g.e.handedTo}`].filter(Boolean).join(" ") || "—"}</td>
                    <td className="py-1.5 pr-3">{[g.e.sealNumber, g.e.waybill].filter(Boolean).join(" / ") || "—"}</td>
                    <td className="py-1.5 pr-3">{g.e.note ?? ""}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Card>
    </div>
  );
}

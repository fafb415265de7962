import type { Metadata } from "next";
import Link from "next/link";
import { PRIORITY_LABELS, SUBMISSION_STATUS_LABELS, formatInstant } from "@/components/submissions/labels";
import { Badge } from "@/components/ui/badge";
import { buttonClass } from "@/components/ui/button";
import { getProject } from "@/lib/dal/projects";
import { roleAllows } from "@/lib/dal/permissions";
import { currentActor, orNotFound } from "@/lib/dal/session";
import { listSubmissions } from "@/lib/dal/submissions";

export const metadata: Metadata = { title: "Submissions" };

export default async function SubmissionsPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await currentActor();
  const [project, items] = await Promise.all([orNotFound(getProject(actor, projectId)), orNotFound(listSubmissions(actor, projectId))]);
  const canWrite = actor.isAdmin || roleAllows(project.role, "submission.write");
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-2xl font-semibold">Lab submissions</h1>
        {canWrite && (
          <Link href={`/projects/${projectId}/submissions/new`} className={buttonClass("primary")}>
            New submission
          </Link>
        )}
      </div>
      <p className="text-sm text-muted">Batches of samples sent to the lab, with the chain of custody of each bag.</p>
      <div className="overflow-x-auto rounded-lg border border-line bg-white">
        <table className="w-full min-w-[720px] text-sm">
          <thead className="bg-stone text-left text-xs uppercase tracking-wide text-muted">
            <tr>
              <th className="px-3 py-2 font-medium">Code</th>
              <th className="px-3 py-2 font-medium">Status</th>
              <th className="px-3 py-2 font-medium">Samples</th>
              <th className="px-3 py-2 font-medium">Analysis</th>
              <th className="px-3 py-2 font-medium">Priority</th>
              <th className="px-3 py-2 font-medium">Sent</th>
              <th className="px-3 py-2 font-medium">Lab batch</th>
              <th className="px-3 py-2 font-medium">Created by</th>
            </tr>
          </thead>
          <tbody>
            {items.map((s) => (
              <tr key={s.id} className="border-t border-line">
                <td className="px-3 py-2">
                  <Link href={`/projects/${projectId}/submissions/${s.id}`} className="font-medium text-brand hover:underline">
                    {s.code}
                  </Link>
                </td>
                <td className="px-3 py-2">
                  <Badge tone={s.status === "reported" ? "ok" : s.status === "draft" ? "neutral" : "brand"}>{SUBMISSION_STATUS_LABELS[s.status]}</Badge>
                </td>
                <td className="px-3 py-2">
                  {s.sampleCount}
                  {s.hazardCount > 0 && (
                    <Badge tone="danger" className="ml-2">
                      {s.hazardCount} suspected asbestos
                    </Badge>
                  )}
                </td>
                <td className="px-3 py-2">{s.requestedAnalysis}</td>
                <td className="px-3 py-2">{PRIORITY_LABELS[s.priority]}</td>
                <td className="px-3 py-2">{s.sentAt ? formatInstant(s.sentAt) : "—"}</td>
                <td className="px-3 py-2">{s.labReference ?? "—"}</td>
                <td className="px-3 py-2">{s.createdByName ?? "—"}</td>
              </tr>
            ))}
            {items.length === 0 && (
              <tr>
                <td colSpan={8} className="px-3 py-8 text-center text-muted">
                  No submissions yet.{canWrite && " Start one from the sample register or with “New submission”."}
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
    </div>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { SubmissionForm } from "@/components/submissions/submission-form";
import { getProject } from "@/lib/dal/projects";
import { roleAllows } from "@/lib/dal/permissions";
import { currentActor, orNotFound } from "@/lib/dal/session";
import { getSamplesForPicker } from "@/lib/dal/submissions";

export const metadata: Metadata = { title: "New submission" };

/** New submission; `?sampleIds=a,b,c` (or repeated) preselects samples, e.g. from the register's selection. */
export default async function NewSubmissionPage({ params, searchParams }: { params: Promise<{ projectId: string }>; searchParams: Promise<{ sampleIds?: string | string[] }> }) {
  const { projectId } = await params;
  const { sampleIds } = await searchParams;
  const actor = await currentActor();
  const project = await orNotFound(getProject(actor, projectId));
  if (!actor.isAdmin && !roleAllows(project.role, "submission.write")) notFound();
  const ids = (Array.isArray(sampleIds) ? sampleIds : [sampleIds ?? ""]).flatMap((s) => s.split(",")).map((s) => s.trim()).filter(Boolean);
  const preselected = await getSamplesForPicker(actor, projectId, ids);
  return (
    <div className="space-y-4">
      <nav className="text-sm text-muted">
        <Link href={`/projects/${projectId}/submissions`} className="hover:underline">
          Submissions
        </Link>{" "}
        / New
      </nav>
      <h1 className="text-2xl font-semibold">New lab submission</h1>
      <SubmissionForm projectId={projectId} defaultLabEmail={project.labEmail ?? ""} preselected={preselected} />
    </div>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { CandidatesNotice } from "@/components/cautions";
import { ScanList } from "@/components/scans/scan-list";
import { buttonClass } from "@/components/ui/button";
import { getProject } from "@/lib/dal/projects";
import { currentActor } from "@/lib/dal/session";

export const metadata: Metadata = { title: "Scans" };

export default async function ScansPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await currentActor();
  const project = await getProject(actor, projectId);
  const canUpload = actor.isAdmin || project.role === "lab_analyst";
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-2xl font-semibold">XRD scans</h1>
        {canUpload && (
          <Link href={`/projects/${projectId}/scans/upload`} className={buttonClass()}>
            Upload scans
          </Link>
        )}
      </div>
      <CandidatesNotice />
      <ScanList projectId={projectId} />
    </div>
  );
}

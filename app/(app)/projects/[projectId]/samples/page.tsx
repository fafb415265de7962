import type { Metadata } from "next";
import { Suspense } from "react";
import { SampleRegisterWithActions } from "@/components/samples/register-toolbar";
import { getProject } from "@/lib/dal/projects";
import { roleAllows } from "@/lib/dal/permissions";
import { currentActor } from "@/lib/dal/session";

export const metadata: Metadata = { title: "Samples" };

export default async function SamplesPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { role } = await getProject(await currentActor(), projectId);
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Sample register</h1>
      <Suspense>
        <SampleRegisterWithActions projectId={projectId} canImport={roleAllows(role, "sample.write")} />
      </Suspense>
    </div>
  );
}

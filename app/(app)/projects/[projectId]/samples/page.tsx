import type { Metadata } from "next";
import Link from "next/link";
import { Suspense } from "react";
import { SampleRegisterWithActions } from "@/components/samples/register-toolbar";
import { buttonClass } from "@/components/ui/button";
import { getProject } from "@/lib/dal/projects";
import { roleAllows } from "@/lib/dal/permissions";
import { currentActor } from "@/lib/dal/session";

export const metadata: Metadata = { title: "Samples" };

export default async function SamplesPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { role } = await getProject(await currentActor(), projectId);
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold">Sample register</h1>
        {roleAllows(role, "sample.write") && (
          <Link href={`/projects/${projectId}/samples/new`} className={buttonClass("primary", "ml-auto")}>
            New sample
          </Link>
        )}
      </div>
      <Suspense>
        <SampleRegisterWithActions projectId={projectId} canImport={roleAllows(role, "sample.write")} />
      </Suspense>
    </div>
  );
}

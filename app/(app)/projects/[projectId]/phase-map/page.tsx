import type { Metadata } from "next";
import { Suspense } from "react";
import { PhaseMapLoader } from "@/components/phase-map/phase-map-loader";
import { roleAllows } from "@/lib/dal/permissions";
import { getProject } from "@/lib/dal/projects";
import { currentActor } from "@/lib/dal/session";

export const metadata: Metadata = { title: "Phase map" };

export default async function PhaseMapPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { role } = await getProject(await currentActor(), projectId);
  return (
    <div className="space-y-3">
      <div>
        <h1 className="text-2xl font-semibold">Phase map</h1>
        <p className="text-sm text-muted">Where each mineral was found. Filled symbols are confirmed phases; dashed outlines are candidates, which are not identifications.</p>
      </div>
      <Suspense>
        <PhaseMapLoader projectId={projectId} canShare={roleAllows(role, "share.manage")} />
      </Suspense>
    </div>
  );
}

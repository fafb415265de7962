import type { Metadata } from "next";
import { QuickCapture } from "@/components/samples/quick-capture";
import { Card } from "@/components/ui/card";
import { ROLE_LABELS, roleAllows } from "@/lib/dal/permissions";
import { getProject } from "@/lib/dal/projects";
import { currentActor, orNotFound } from "@/lib/dal/session";
import { listStations } from "@/lib/dal/stations";

export const metadata: Metadata = { title: "New sample here" };

export default async function QuickSamplePage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await currentActor();
  const project = await orNotFound(getProject(actor, projectId));
  const canWrite = roleAllows(project.role, "sample.write");
  const { items } = await listStations(actor, projectId);
  return (
    <div className="max-w-2xl space-y-4">
      <h1 className="text-2xl font-semibold">New sample here</h1>
      <Card>
        {canWrite ? (
          <QuickCapture
            projectId={projectId}
            userId={actor.userId}
            stations={items.map((s) => ({ id: s.id, code: s.code, name: s.name }))}
            defaultZone={project.timeZone ?? null}
          />
        ) : (
          <p className="text-sm">Your role ({ROLE_LABELS[project.role]}) cannot create samples.</p>
        )}
      </Card>
    </div>
  );
}

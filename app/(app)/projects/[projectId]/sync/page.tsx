import type { Metadata } from "next";
import { SyncPanelLoader } from "@/components/sync/sync-panel-loader";
import { Card } from "@/components/ui/card";
import { roleAllows } from "@/lib/dal/permissions";
import { getProject } from "@/lib/dal/projects";
import { currentActor, orNotFound } from "@/lib/dal/session";

export const metadata: Metadata = { title: "Sync" };

export default async function SyncPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await currentActor();
  const project = await orNotFound(getProject(actor, projectId));
  return (
    <div className="max-w-3xl space-y-4">
      <h1 className="text-2xl font-semibold">Sync</h1>
      <p className="text-sm text-muted">
        Stations and samples saved without a connection wait here on this device and are sent when the connection returns. A record someone else
        changed meanwhile is shown side by side for you to choose; nothing is overwritten silently.
      </p>
      <Card>
        <SyncPanelLoader projectId={projectId} userId={actor.userId} canReserve={roleAllows(project.role, "sample.write") && !project.archivedAt} />
      </Card>
    </div>
  );
}

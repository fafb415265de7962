import type { Metadata } from "next";
import { ArchiveButton, ProjectForm } from "@/components/projects/project-form";
import { Card } from "@/components/ui/card";
import { formatDateTime } from "@/lib/dates";
import { getProjectSettings } from "@/lib/dal/projects";
import { currentActor, orNotFound } from "@/lib/dal/session";

export const metadata: Metadata = { title: "Project settings" };

/** Project settings (lead, site admin): name, code, zone, lab, scan defaults, code pattern; archive. */
export default async function ProjectSettingsPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await currentActor();
  const p = await orNotFound(getProjectSettings(actor, projectId));
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Project settings</h1>
      <Card>
        <ProjectForm
          project={{
            id: p.id,
            code: p.code,
            name: p.name,
            region: p.region,
            description: p.description,
            timeZone: p.timeZone,
            labEmail: p.labEmail,
            labAddress: p.labAddress,
            labInHouse: p.labInHouse,
            defaultAnode: p.defaultAnode,
            defaultInstrument: p.defaultInstrument,
            sampleCodePattern: p.sampleCodePattern,
            version: p.version,
          }}
          codeLocked={p.codeLocked}
        />
      </Card>
      <Card className="space-y-2">
        <h2 className="font-semibold">Archive</h2>
        <p className="text-sm text-muted">
          {p.archivedAt
            ? `Archived ${formatDateTime(p.archivedAt, p.timeZone)}: read-only for everyone; the audit log and exports stay available.`
            : "An archived project stays readable and exportable, but nothing in it can be changed until a lead brings it back."}
        </p>
        <ArchiveButton projectId={p.id} archived={!!p.archivedAt} />
      </Card>
    </div>
  );
}

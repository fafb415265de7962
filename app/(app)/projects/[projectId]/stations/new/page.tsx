import type { Metadata } from "next";
import Link from "next/link";
import { FieldTermLists } from "@/components/samples/field-terms";
import { StationForm } from "@/components/stations/station-form";
import { Card } from "@/components/ui/card";
import { ROLE_LABELS, roleAllows } from "@/lib/dal/permissions";
import { getProject } from "@/lib/dal/projects";
import { currentActor, orNotFound } from "@/lib/dal/session";
import { nextStationCode } from "@/lib/dal/stations";

export const metadata: Metadata = { title: "New station" };

export default async function NewStationPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await currentActor();
  const project = await orNotFound(getProject(actor, projectId));
  const canWrite = roleAllows(project.role, "station.write");
  return (
    <div className="max-w-4xl space-y-4">
      <nav className="text-sm text-muted">
        <Link href={`/projects/${projectId}/stations`} className="hover:underline">
          Stations
        </Link>{" "}
        / new
      </nav>
      <h1 className="text-2xl font-semibold">New station</h1>
      {canWrite ? (
        <Card>
          <FieldTermLists />
          <StationForm projectId={projectId} nextCode={await nextStationCode(actor, projectId)} />
        </Card>
      ) : (
        <Card>
          <p className="text-sm">Your role ({ROLE_LABELS[project.role]}) cannot create stations. Ask the project lead or a field geologist.</p>
        </Card>
      )}
    </div>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { SampleForm } from "@/components/samples/sample-form";
import { Card } from "@/components/ui/card";
import { ROLE_LABELS, roleAllows } from "@/lib/dal/permissions";
import { getProject } from "@/lib/dal/projects";
import { currentActor, orNotFound } from "@/lib/dal/session";
import { listStations } from "@/lib/dal/stations";

export const metadata: Metadata = { title: "New sample" };

export default async function NewSamplePage({ params, searchParams }: { params: Promise<{ projectId: string }>; searchParams: Promise<{ stationId?: string }> }) {
  const { projectId } = await params;
  const { stationId } = await searchParams;
  const actor = await currentActor();
  const project = await orNotFound(getProject(actor, projectId));
  const canWrite = roleAllows(project.role, "sample.write");
  const { items } = await listStations(actor, projectId);
  const stations = items.map((s) => ({ id: s.id, code: s.code, name: s.name, lat: s.lat, lon: s.lon }));
  const preset = stations.find((s) => s.id === stationId)?.id ?? null;
  return (
    <div className="max-w-5xl space-y-4">
      <nav className="text-sm text-muted">
        <Link href={`/projects/${projectId}/samples`} className="hover:underline">
          Sample register
        </Link>{" "}
        / new
      </nav>
      <h1 className="text-2xl font-semibold">New sample</h1>
      <Card>
        {canWrite ? (
          <SampleForm
            projectId={projectId}
            stations={stations}
            userId={actor.userId}
            defaults={{ stationId: preset, collectorName: actor.name }}
          />
        ) : (
          <p className="text-sm">Your role ({ROLE_LABELS[project.role]}) cannot create samples.</p>
        )}
      </Card>
    </div>
  );
}

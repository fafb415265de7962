import type { Metadata } from "next";
import Link from "next/link";
import { SampleForm, type SampleRecord } from "@/components/samples/sample-form";
import { Card } from "@/components/ui/card";
import { ROLE_LABELS, roleAllows } from "@/lib/dal/permissions";
import { getSampleOrThrow } from "@/lib/dal/samples";
import { currentActor, orNotFound } from "@/lib/dal/session";
import { listStations } from "@/lib/dal/stations";
import type { SampleDetails } from "@/lib/validation/sample-details";

export const metadata: Metadata = { title: "Edit sample" };

export default async function EditSamplePage({ params }: { params: Promise<{ projectId: string; sampleId: string }> }) {
  const { projectId, sampleId } = await params;
  const actor = await currentActor();
  const s = await orNotFound(getSampleOrThrow(actor, projectId, sampleId));
  const canWrite = roleAllows(s.role, "sample.write");
  const { items } = await listStations(actor, projectId);
  const record: SampleRecord = {
    id: s.id,
    code: s.code,
    version: s.version,
    status: s.status,
    igsn: s.igsn,
    stationId: s.stationId,
    sampleType: s.sampleType,
    typeDetails: (s.typeDetails as SampleDetails | null) ?? null,
    lithology: s.lithology,
    alteration: s.alteration,
    alterationIntensity: s.alterationIntensity,
    description: s.description,
    collectedAt: s.collectedAt,
    collectedTz: s.collectedTz,
    collectorName: s.collectorName,
    lat: s.lat,
    lon: s.lon,
    elevationM: s.elevationM,
    elevationRef: s.elevationRef,
    horizontalAccuracyM: s.horizontalAccuracyM,
    locationSource: s.locationSource,
    locationFixedAt: s.locationFixedAt,
    storageLocation: s.storageLocation,
    suspectedAsbestos: s.suspectedAsbestos,
    weightKg: s.weightKg,
  };
  return (
    <div className="max-w-5xl space-y-4">
      <nav className="text-sm text-muted">
        <Link href={`/projects/${projectId}/samples`} className="hover:underline">
          Sample register
        </Link>{" "}
        /{" "}
        <Link href={`/projects/${projectId}/samples/${sampleId}`} className="hover:underline">
          {s.code}
        </Link>{" "}
        / edit
      </nav>
      <h1 className="text-2xl font-semibold">Edit sample {s.code}</h1>
      <Card>
        {canWrite ? (
          <SampleForm projectId={projectId} sample={record} stations={items.map((x) => ({ id: x.id, code: x.code, name: x.name, lat: x.lat, lon: x.lon }))} />
        ) : (
          <p className="text-sm">Your role ({ROLE_LABELS[s.role]}) cannot edit samples.</p>
        )}
      </Card>
    </div>
  );
}

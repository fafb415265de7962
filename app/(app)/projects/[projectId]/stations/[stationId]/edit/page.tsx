import type { Metadata } from "next";
import Link from "next/link";
import { FieldTermLists } from "@/components/samples/field-terms";
import { StationForm } from "@/components/stations/station-form";
import { Card } from "@/components/ui/card";
import { ROLE_LABELS, roleAllows } from "@/lib/dal/permissions";
import { currentActor, orNotFound } from "@/lib/dal/session";
import { getStationOrThrow } from "@/lib/dal/stations";

export const metadata: Metadata = { title: "Edit station" };

export default async function EditStationPage({ params }: { params: Promise<{ projectId: string; stationId: string }> }) {
  const { projectId, stationId } = await params;
  const actor = await currentActor();
  const st = await orNotFound(getStationOrThrow(actor, projectId, stationId));
  const canWrite = roleAllows(st.role, "station.write");
  return (
    <div className="max-w-4xl space-y-4">
      <nav className="text-sm text-muted">
        <Link href={`/projects/${projectId}/stations`} className="hover:underline">
          Stations
        </Link>{" "}
        /{" "}
        <Link href={`/projects/${projectId}/stations/${stationId}`} className="hover:underline">
          {st.code}
        </Link>{" "}
        / edit
      </nav>
      <h1 className="text-2xl font-semibold">Edit station {st.code}</h1>
      <Card>
        {canWrite ? (
          <>
            <FieldTermLists />
            <StationForm
              projectId={projectId}
              station={{
                id: st.id,
                code: st.code,
                name: st.name,
                lat: st.lat,
                lon: st.lon,
                elevationM: st.elevationM,
                elevationRef: st.elevationRef,
                horizontalAccuracyM: st.horizontalAccuracyM,
                locationSource: st.locationSource,
                locationFixedAt: st.locationFixedAt,
                lithology: st.lithology,
                description: st.description,
                observedAt: st.observedAt,
                version: st.version,
              }}
            />
          </>
        ) : (
          <p className="text-sm">Your role ({ROLE_LABELS[st.role]}) cannot edit or move stations.</p>
        )}
      </Card>
    </div>
  );
}

import type { Metadata } from "next";
import { DetailRow as Row } from "@/components/ui/detail-row";
import Link from "next/link";
import { PhotoGallery } from "@/components/photos/photo-gallery";
import { ELEVATION_REF_LABELS, LOCATION_SOURCE_LABELS } from "@/components/stations/location-labels";
import { StructureForm } from "@/components/stations/structure-form";
import { StructureTable } from "@/components/stations/structure-table";
import { Badge } from "@/components/ui/badge";
import { buttonClass } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { roleAllows } from "@/lib/dal/permissions";
import { recordTitle } from "@/lib/dal/record-titles";
import { currentActor, orNotFound } from "@/lib/dal/session";
import { getStationOrThrow } from "@/lib/dal/stations";
import { SAMPLE_STATUS_LABELS, SAMPLE_TYPE_LABELS, formatCollected, formatDate, formatLatLon } from "@/lib/format";
import { formatDmsPair, formatUtm, toUtm } from "@/lib/geo";

/** The record in the title (e.g. "Sample APR-000123 · Lithodex"); a plain title when it is not visible. */
export async function generateMetadata({ params }: { params: Promise<{ projectId: string; stationId: string }> }): Promise<Metadata> {
  const { projectId, stationId } = await params;
  return { title: (await recordTitle(await currentActor(), projectId, "station", stationId)) ?? "Station" };
}


function utm(lat: number, lon: number): string {
  try {
    return `${formatUtm(toUtm(lat, lon), 1)} m`;
  } catch (e) {
    return (e as Error).message;
  }
}

export default async function StationPage({ params }: { params: Promise<{ projectId: string; stationId: string }> }) {
  const { projectId, stationId } = await params;
  const actor = await currentActor();
  const st = await orNotFound(getStationOrThrow(actor, projectId, stationId));
  const canWrite = roleAllows(st.role, "station.write");
  const canWriteSamples = roleAllows(st.role, "sample.write");
  const planes = st.structures.filter((s) => s.kind === "planar" && s.dipDirection != null && s.dip != null).map((s) => ({ id: s.id, feature: s.feature, dipDirection: s.dipDirection!, dip: s.dip! }));
  return (
    <div className="space-y-4">
      <nav className="text-sm text-muted">
        <Link href={`/projects/${projectId}/stations`} className="hover:underline">
          Stations
        </Link>{" "}
        / {st.code}
      </nav>
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold" data-testid="station-code">
          {st.code}
        </h1>
        {st.name && <span className="text-lg text-muted">{st.name}</span>}
        {canWrite && (
          <Link href={`/projects/${projectId}/stations/${stationId}/edit`} className={buttonClass("secondary", "ml-auto")}>
            Edit or move
          </Link>
        )}
      </div>
      <div className="grid gap-4 lg:grid-cols-2">
        <Card>
          <h2 className="mb-2 font-semibold">Location</h2>
          <dl>
            <Row label="WGS84">{formatLatLon(st.lat, st.lon)}</Row>
            <Row label="DMS">{formatDmsPair(st.lat, st.lon)}</Row>
            <Row label="UTM">{utm(st.lat, st.lon)}</Row>
            <Row label="Elevation">{st.elevationM != null ? `${st.elevationM} m ${st.elevationRef ? ELEVATION_REF_LABELS[st.elevationRef] : "(reference not recorded)"}` : null}</Row>
            <Row label="Horizontal accuracy">{st.horizontalAccuracyM != null ? `± ${st.horizontalAccuracyM} m` : null}</Row>
            <Row label="Source">{st.locationSource ? LOCATION_SOURCE_LABELS[st.locationSource] : null}</Row>
            {st.locationFixedAt && <Row label="Fix time">{formatCollected(st.locationFixedAt)}</Row>}
          </dl>
        </Card>
        <Card>
          <h2 className="mb-2 font-semibold">Observation</h2>
          <dl>
            <Row label="Lithology">{st.lithology}</Row>
            <Row label="Observed">{st.observedAt ? formatCollected(st.observedAt) : null}</Row>
            <Row label="Description">{st.description}</Row>
          </dl>
          <p className="mt-2 text-xs text-muted">Record version {st.version}.</p>
        </Card>
      </div>
      <Card>
        <h2 className="mb-3 font-semibold">Structural measurements</h2>
        <StructureTable projectId={projectId} stationId={stationId} items={st.structures} canWrite={canWrite} />
        {canWrite && (
          <details className="mt-4 rounded-md border border-line p-3" open={st.structures.length === 0}>
            <summary className="cursor-pointer text-sm font-medium text-brand">Add a measurement</summary>
            <div className="mt-3">
              <StructureForm projectId={projectId} stationId={stationId} planes={planes} />
            </div>
          </details>
        )}
      </Card>
      <Card>
        <div className="mb-3 flex flex-wrap items-center gap-3">
          <h2 className="font-semibold">Samples at this station</h2>
          {canWriteSamples && (
            <Link href={`/projects/${projectId}/samples/new?stationId=${stationId}`} className={buttonClass("secondary", "ml-auto")}>
              New sample here
            </Link>
          )}
        </div>
        {st.samples.length === 0 ? (
          <p className="text-sm text-muted">No samples yet.</p>
        ) : (
          <ul className="divide-y divide-line text-sm">
            {st.samples.map((s) => (
              <li key={s.id} className="flex flex-wrap items-center gap-2 py-2">
                <Link href={`/projects/${projectId}/samples/${s.id}`} className="font-medium text-brand hover:underline">
                  {s.code}
                </Link>
                <span>{SAMPLE_TYPE_LABELS[s.sampleType]}</span>
                {s.lithology && <span className="text-muted">{s.lithology}</span>}
                <Badge>{SAMPLE_STATUS_LABELS[s.status]}</Badge>
                {s.suspectedAsbestos && <Badge tone="danger">Suspected asbestos</Badge>}
                <span className="ml-auto text-xs text-muted">{formatDate(s.collectedAt)}</span>
              </li>
            ))}
          </ul>
        )}
      </Card>
      <Card>
        <h2 className="mb-3 font-semibold">Station photos</h2>
        <PhotoGallery projectId={projectId} owner={{ stationId }} canWrite={canWrite} />
      </Card>
    </div>
  );
}

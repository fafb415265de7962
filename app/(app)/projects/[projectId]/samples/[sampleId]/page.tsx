import type { Metadata } from "next";
import { DetailRow as Row } from "@/components/ui/detail-row";
import Link from "next/link";
import { notFound } from "next/navigation";
import { CustodyHistory } from "@/components/custody/custody-history";
import { SamplePhases } from "@/components/scans/sample-phases";
import { SamplePhotos } from "@/components/photos/sample-photos";
import { typeDetailsSummary } from "@/components/samples/type-details-summary";
import { Badge } from "@/components/ui/badge";
import { Card } from "@/components/ui/card";
import { AppError } from "@/lib/dal/errors";
import { roleAllows } from "@/lib/dal/permissions";
import { getSampleOrThrow } from "@/lib/dal/samples";
import type { SampleDetails } from "@/lib/validation/sample-details";
import { recordTitle } from "@/lib/dal/record-titles";
import { currentActor } from "@/lib/dal/session";
import { SAMPLE_STATUS_LABELS, SAMPLE_TYPE_LABELS, formatCollected, formatLatLon } from "@/lib/format";

/** The record in the title (e.g. "Sample APR-000123 · Lithodex"); a plain title when it is not visible. */
export async function generateMetadata({ params }: { params: Promise<{ projectId: string; sampleId: string }> }): Promise<Metadata> {
  const { projectId, sampleId } = await params;
  return { title: (await recordTitle(await currentActor(), projectId, "sample", sampleId)) ?? "Sample" };
}


export default async function SamplePage({ params }: { params: Promise<{ projectId: string; sampleId: string }> }) {
  const { projectId, sampleId } = await params;
  const actor = await currentActor();
  const s = await getSampleOrThrow(actor, projectId, sampleId).catch((err) => {
    if (err instanceof AppError && err.code === "not_found") notFound();
    throw err;
  });
  return (
    <div className="space-y-4">
      <nav className="text-sm text-muted">
        <Link href={`/projects/${projectId}/samples`} className="hover:underline">
          Sample register
        </Link>{" "}
        / {s.code}
      </nav>
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold" data-testid="sample-code">
          {s.code}
        </h1>
        <Badge tone={s.status === "confirmed" ? "ok" : "brand"}>{SAMPLE_STATUS_LABELS[s.status]}</Badge>
        {s.suspectedAsbestos && <Badge tone="danger">Suspected asbestos — handle as hazardous</Badge>}
        <Link href={`/projects/${projectId}/labels?ids=${s.id}`} className="no-print ml-auto text-sm font-medium text-brand hover:underline">
          Print label
        </Link>
        {roleAllows(s.role, "sample.write") && (
          <Link href={`/projects/${projectId}/samples/${s.id}/edit`} className="no-print text-sm font-medium text-brand hover:underline" data-testid="edit-sample">
            Edit
          </Link>
        )}
        <a href="#photos" className="no-print text-sm font-medium text-brand hover:underline">
          Photos
        </a>
      </div>
      <div className="grid gap-4 lg:grid-cols-2">
        <Card>
          <h2 className="mb-2 font-semibold">Description</h2>
          <dl>
            <Row label="Type">{SAMPLE_TYPE_LABELS[s.sampleType]}</Row>
            <Row label="Type details">{typeDetailsSummary(s.typeDetails as SampleDetails | null)}</Row>
            <Row label="Lithology">{s.lithology}</Row>
            <Row label="Alteration">{[s.alteration, s.alterationIntensity].filter(Boolean).join(", ") || null}</Row>
            <Row label="Description">{s.description}</Row>
            <Row label="IGSN">{s.igsn}</Row>
            <Row label="Weight">{s.weightKg != null ? `${s.weightKg} kg` : null}</Row>
          </dl>
        </Card>
        <Card>
          <h2 className="mb-2 font-semibold">Collection</h2>
          <dl>
            <Row label="Station">{s.station ? <Link href={`/projects/${projectId}/stations/${s.station.id}`} className="text-brand hover:underline">{`${s.station.code}${s.station.name ? ` — ${s.station.name}` : ""}`}</Link> : null}</Row>
            <Row label="Collected">{formatCollected(s.collectedAt, s.collectedTz)}</Row>
            <Row label="Collector">{s.collectorName}</Row>
            <Row label="Position (WGS84)">{formatLatLon(s.lat ?? s.station?.lat, s.lon ?? s.station?.lon)}</Row>
            <Row label="Elevation">{s.elevationM != null ? `${s.elevationM} m` : null}</Row>
            <Row label="Horizontal accuracy">{s.horizontalAccuracyM != null ? `± ${s.horizontalAccuracyM} m` : null}</Row>
            <Row label="Storage">{s.storageLocation}</Row>
          </dl>
        </Card>
      </div>
      <SamplePhotos
        projectId={projectId}
        canWrite={roleAllows(s.role, "sample.write")}
        sample={{ id: s.id, version: s.version, lat: s.lat, lon: s.lon, stationCode: s.station?.code ?? null }}
      />
      <SamplePhases actor={actor} projectId={projectId} sampleId={sampleId} canUpload={actor.isAdmin || s.role === "lab_analyst"} />
      <CustodyHistory projectId={projectId} sampleId={sampleId} />
      <p className="text-xs text-muted">Record version {s.version}.</p>
    </div>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { XRAY_EQUIPMENT_NOTE } from "@/components/cautions";
import { ScanUpload } from "@/components/scans/scan-upload";
import { AppError } from "@/lib/dal/errors";
import { getProject } from "@/lib/dal/projects";
import { getSampleOrThrow } from "@/lib/dal/samples";
import { currentActor } from "@/lib/dal/session";

export const metadata: Metadata = { title: "Upload scans" };

export default async function UploadScansPage({ params, searchParams }: { params: Promise<{ projectId: string }>; searchParams: Promise<{ sample?: string }> }) {
  const { projectId } = await params;
  const { sample } = await searchParams;
  const actor = await currentActor();
  const project = await getProject(actor, projectId);
  const canUpload = actor.isAdmin || project.role === "lab_analyst";
  const initial = sample
    ? await getSampleOrThrow(actor, projectId, sample).then(
        (s) => ({ id: s.id, code: s.code, lithology: s.lithology, status: s.status }),
        (err) => {
          if (err instanceof AppError && err.code === "not_found") return null;
          throw err;
        },
      )
    : null;
  return (
    <div className="mx-auto max-w-4xl space-y-4">
      <nav className="text-sm text-muted">
        <Link href={`/projects/${projectId}/scans`} className="hover:underline">
          Scans
        </Link>{" "}
        / Upload
      </nav>
      <h1 className="text-2xl font-semibold">Upload scans</h1>
      {canUpload ? (
        <>
          <p className="text-sm text-muted">
            Text scans only: XY (or XYE), CSV or pdCIF. Columns are read by their names (2θ or d, counts or counts per second, esd, counting time); d needs the wavelength and
            counts per second the time per step, from the file or the form. The file is kept byte for byte; processing (smoothing, background, Kα2 stripping when present, peak fitting)
            and phase search start on the server as soon as it is stored. A file the reader cannot use is refused with the line at fault, and nothing is stored.
          </p>
          <p className="text-sm text-muted" data-testid="upload-custody-rule">
            A scan is attached only to a sample the lab has received: record the intake on its submission first (or, in a project whose lab is in-house, “received directly” on the
            sample page).
          </p>
          <div className="rounded-lg border border-line bg-white p-4 shadow-sm">
            <ScanUpload projectId={projectId} initialSample={initial} defaults={{ anode: project.defaultAnode ?? null, instrument: project.defaultInstrument ?? null }} />
          </div>
          <p className="text-xs text-muted">{XRAY_EQUIPMENT_NOTE}</p>
        </>
      ) : (
        <p className="rounded-md border border-line bg-white p-4 text-sm">Only lab analysts upload and process scans in this project. You can view scans and their results.</p>
      )}
    </div>
  );
}

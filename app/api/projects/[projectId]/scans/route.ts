import { BODY_LIMITS } from "@/lib/api/body";
import { created, withActor } from "@/lib/api/handler";
import { listScans, uploadScan } from "@/lib/dal/scans";
import { readMultipart } from "./multipart";

const query = (url: URL) => Object.fromEntries([...url.searchParams.entries()].filter(([, v]) => v !== ""));

// GET /api/projects/:projectId/scans — scans with status and processing progress, newest first (any member)
export const GET = withActor<{ projectId: string }>(async ({ actor, params, url }) => listScans(actor, params.projectId, query(url)));

// POST /api/projects/:projectId/scans — upload one scan file (multipart: file, sampleId, anode|wavelength, instrument, timePerStepS…) and queue its processing (lab analyst)
export const POST = withActor<{ projectId: string }>({ permission: "scan.write", body: { kind: "multipart", maxBytes: BODY_LIMITS.scan, label: "a scan upload" } }, async ({ actor, params, req }) => {
  const { fields, files } = await readMultipart(req);
  return created(await uploadScan(actor, params.projectId, fields, files[0] ?? null));
});

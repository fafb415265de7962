import { BODY_LIMITS } from "@/lib/api/body";
import { created } from "@/lib/api/handler";
import { withToken } from "@/lib/api/public";
import { labUploadScan, resolveLabToken } from "@/lib/dal/lab-links";
import { readMultipart } from "@/app/api/projects/[projectId]/scans/multipart";

// POST /api/lab/:token/scans — the outside lab uploads one scan (multipart: file, sampleId, uploadedBy, anode|wavelength…) for a sample on the manifest only
export const POST = withToken<{ token: string }>(
  { check: (p) => resolveLabToken(p.token), body: { kind: "multipart", maxBytes: BODY_LIMITS.scan, label: "a scan upload" } },
  async ({ req, params }) => {
    const { fields, files } = await readMultipart(req);
    return created(await labUploadScan(params.token, fields, files[0] ?? null));
  },
);

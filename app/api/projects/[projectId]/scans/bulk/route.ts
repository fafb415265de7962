import { BODY_LIMITS } from "@/lib/api/body";
import { withActor } from "@/lib/api/handler";
import { AppError } from "@/lib/dal/errors";
import { commitBulkScans, previewBulkScans } from "@/lib/dal/scans";
import { readMultipart } from "../multipart";

// POST /api/projects/:projectId/scans/bulk?mode=preview|commit — many files matched to samples by name (multipart: files, settings, assignments?, skipUnmatched?); preview stores nothing, commit stores all or nothing (lab analyst)
export const POST = withActor<{ projectId: string }>({ permission: "scan.write", body: { kind: "multipart", maxBytes: BODY_LIMITS.scan, label: "a scan upload" } }, async ({ actor, params, req, url }) => {
  const mode = url.searchParams.get("mode") ?? "preview";
  if (mode !== "preview" && mode !== "commit") throw new AppError("validation_failed", "Some query parameters are not valid.", { mode: ["mode must be preview or commit."] });
  const { fields, files } = await readMultipart(req);
  if (mode === "preview") return previewBulkScans(actor, params.projectId, fields, files);
  return Response.json(await commitBulkScans(actor, params.projectId, fields, files), { status: 201 });
});

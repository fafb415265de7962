import { withActor } from "@/lib/api/handler";
import { getScanFile } from "@/lib/dal/scans";
import { contentDisposition } from "@/lib/storage/file-name";

// GET /api/projects/:projectId/scans/:scanId/file — the original file as uploaded, byte for byte (any member)
export const GET = withActor<{ projectId: string; scanId: string }>(async ({ actor, params }) => {
  const f = await getScanFile(actor, params.projectId, params.scanId);
  return new Response(f.stream, {
    headers: {
      "content-type": "application/octet-stream",
      "content-disposition": contentDisposition(f.name),
      "x-content-sha256": f.sha256,
    },
  });
});

import { withActor } from "@/lib/api/handler";
import { getScanFile } from "@/lib/dal/scans";

// GET /api/projects/:projectId/scans/:scanId/file — the original file as uploaded, byte for byte (any member)
export const GET = withActor<{ projectId: string; scanId: string }>(async ({ actor, params }) => {
  const f = await getScanFile(actor, params.projectId, params.scanId);
  const ascii = f.name.replace(/[^\x20-\x7e]|["\\]/g, "_");
  return new Response(f.stream, {
    headers: {
      "content-type": "application/octet-stream",
      "content-disposition": `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(f.name)}`,
      "x-content-sha256": f.sha256,
    },
  });
});

import { withActor } from "@/lib/api/handler";
import { getTilePackageTile } from "@/lib/dal/tile-packages";

// GET /api/projects/:projectId/tile-packages/:pkgId/tiles/:z/:x/:y — one XYZ tile (200 image, 204 when the package has none there; members only)
export const GET = withActor<{ projectId: string; pkgId: string; z: string; x: string; y: string }>(async ({ actor, params }) => {
  const tile = await getTilePackageTile(actor, params.projectId, params.pkgId, params.z, params.x, params.y);
  if (!tile) return new Response(null, { status: 204, headers: { "cache-control": "private, max-age=3600" } });
  return new Response(tile.bytes as BodyInit, {
    headers: { "content-type": tile.contentType, "content-length": String(tile.bytes.byteLength), "cache-control": "private, max-age=86400", "x-content-type-options": "nosniff" },
  });
});

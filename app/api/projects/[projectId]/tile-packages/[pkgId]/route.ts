import { withActor } from "@/lib/api/handler";
import { deleteTilePackage } from "@/lib/dal/tile-packages";

// DELETE /api/projects/:projectId/tile-packages/:pkgId — remove a map layer and its file (lead, field geologist)
export const DELETE = withActor<{ projectId: string; pkgId: string }>({ permission: "tiles.manage" }, async ({ actor, params }) => {
  await deleteTilePackage(actor, params.projectId, params.pkgId);
  return new Response(null, { status: 204 });
});

import { created, parseJson, withActor } from "@/lib/api/handler";
import { createShareLink, listShareLinks } from "@/lib/dal/share-links";

// GET /api/projects/:projectId/share-links — the project's read-only share links and their state (lead)
export const GET = withActor<{ projectId: string }>(async ({ actor, params }) => ({ items: await listShareLinks(actor, params.projectId) }));

// POST /api/projects/:projectId/share-links — create a time-limited read-only link to a filtered register; the token is in the answer only (lead)
export const POST = withActor<{ projectId: string }>({ permission: "share.manage" }, async ({ actor, params, req, url }) => {
  const link = await createShareLink(actor, params.projectId, await parseJson(req));
  return created({ ...link, url: `${url.origin}/share/${link.token}` });
});

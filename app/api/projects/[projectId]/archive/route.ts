import { parseJson, withActor } from "@/lib/api/handler";
import { setProjectArchived } from "@/lib/dal/projects";

// POST /api/projects/:projectId/archive — {archived: true|false}: archive (read-only) or bring back (lead)
export const POST = withActor<{ projectId: string }>({ permission: "project.manage" }, async ({ actor, params, req }) => setProjectArchived(actor, params.projectId, await parseJson(req)));

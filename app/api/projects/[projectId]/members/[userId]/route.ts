import { parseJson, withActor } from "@/lib/api/handler";
import { removeMember, updateMemberRole } from "@/lib/dal/members";

// PATCH /api/projects/:projectId/members/:userId — change a member's role (lead)
export const PATCH = withActor<{ projectId: string; userId: string }>({ permission: "project.manage" }, async ({ req, params, actor }) => updateMemberRole(actor, params.projectId, params.userId, await parseJson(req)));

// DELETE /api/projects/:projectId/members/:userId — remove a member from the project (lead)
export const DELETE = withActor<{ projectId: string; userId: string }>({ permission: "project.manage" }, async ({ params, actor }) => removeMember(actor, params.projectId, params.userId));

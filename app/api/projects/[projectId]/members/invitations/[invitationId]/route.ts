import { withActor } from "@/lib/api/handler";
import { revokeInvitation } from "@/lib/dal/invitations";

// DELETE /api/projects/:projectId/members/invitations/:invitationId — withdraw a pending invitation (lead)
export const DELETE = withActor<{ projectId: string; invitationId: string }>({ permission: "project.manage" }, async ({ params, actor }) => revokeInvitation(actor, params.projectId, params.invitationId));

import { withActor } from "@/lib/api/handler";
import { revokeShareLink } from "@/lib/dal/share-links";

// DELETE /api/projects/:projectId/share-links/:linkId — revoke a share link at once; the record stays for the audit trail (lead)
export const DELETE = withActor<{ projectId: string; linkId: string }>({ permission: "share.manage" }, async ({ actor, params }) => revokeShareLink(actor, params.projectId, params.linkId));

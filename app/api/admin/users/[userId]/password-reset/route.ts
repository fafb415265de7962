import { withActor } from "@/lib/api/handler";
import { requireSiteAdmin, sendPasswordReset } from "@/lib/dal/users";

// POST /api/admin/users/:userId/password-reset — e-mail a single-use link to set a new password (site admin)
export const POST = withActor<{ userId: string }>({ access: async (actor) => requireSiteAdmin(actor) }, async ({ actor, params }) => sendPasswordReset(actor, params.userId));

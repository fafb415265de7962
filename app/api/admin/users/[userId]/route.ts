import { parseJson, withActor } from "@/lib/api/handler";
import { requireSiteAdmin, updateUser } from "@/lib/dal/users";

// PATCH /api/admin/users/:userId — {disabled?, siteAdmin?, reason?}: disable/enable, grant/withdraw site admin (the last admin stays; site admin)
export const PATCH = withActor<{ userId: string }>({ access: async (actor) => requireSiteAdmin(actor) }, async ({ actor, params, req }) => updateUser(actor, params.userId, await parseJson(req)));

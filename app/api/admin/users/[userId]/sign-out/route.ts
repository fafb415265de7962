import { withActor } from "@/lib/api/handler";
import { requireSiteAdmin, signOutEverywhere } from "@/lib/dal/users";

// POST /api/admin/users/:userId/sign-out — end every session of the account now (site admin)
export const POST = withActor<{ userId: string }>({ access: async (actor) => requireSiteAdmin(actor) }, async ({ actor, params }) => signOutEverywhere(actor, params.userId));

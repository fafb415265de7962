import { created, parseJson, withActor } from "@/lib/api/handler";
import { inviteUser, listUsers, requireSiteAdmin } from "@/lib/dal/users";

const siteAdmin = { access: async (actor: Parameters<typeof requireSiteAdmin>[0]) => requireSiteAdmin(actor) };

// GET /api/admin/users?q= — every account with its state (site admin)
export const GET = withActor(siteAdmin, async ({ actor, url }) => ({ items: await listUsers(actor, { q: url.searchParams.get("q") || undefined }) }));

// POST /api/admin/users — create an account and e-mail a link to set its password ({email, name, siteAdmin?}; site admin)
export const POST = withActor(siteAdmin, async ({ actor, req }) => created(await inviteUser(actor, await parseJson(req))));

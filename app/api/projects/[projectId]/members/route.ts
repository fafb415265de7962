import { created, parseJson, withActor } from "@/lib/api/handler";
import { createInvitation } from "@/lib/dal/invitations";
import { listMembers } from "@/lib/dal/members";

// GET /api/projects/:projectId/members — the team with roles; pending invitations for leads (any member)
export const GET = withActor<{ projectId: string }>(async ({ params, actor }) => listMembers(actor, params.projectId));

// POST /api/projects/:projectId/members — invite by e-mail with a role; sends a single-use link (lead)
export const POST = withActor<{ projectId: string }>({ permission: "project.manage" }, async ({ req, params, actor }) => created(await createInvitation(actor, params.projectId, await parseJson(req))));

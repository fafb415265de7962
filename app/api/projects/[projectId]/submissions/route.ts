import { created, parseJson, withActor } from "@/lib/api/handler";
import { createSubmission, listSubmissions } from "@/lib/dal/submissions";

// GET /api/projects/:projectId/submissions — list the project's lab submissions, newest first (any member)
export const GET = withActor<{ projectId: string }>(async ({ params, actor, url }) => ({
  items: await listSubmissions(actor, params.projectId, Object.fromEntries(url.searchParams)),
}));

// POST /api/projects/:projectId/submissions — create a draft submission from selected samples (lead, field geologist)
export const POST = withActor<{ projectId: string }>({ permission: "submission.write" }, async ({ req, params, actor }) => created(await createSubmission(actor, params.projectId, await parseJson(req))));

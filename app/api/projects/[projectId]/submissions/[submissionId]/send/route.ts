import { parseJson, withActor } from "@/lib/api/handler";
import { sendSubmission } from "@/lib/dal/submissions";

// POST /api/projects/:projectId/submissions/:submissionId/send — dispatch: custody "dispatched" per sample, e-mail the lab (lead, field geologist)
export const POST = withActor<{ projectId: string; submissionId: string }>({ permission: "submission.write" }, async ({ req, params, actor }) => sendSubmission(actor, params.projectId, params.submissionId, await parseJson(req)));

import { parseJson, withActor } from "@/lib/api/handler";
import { receiveSubmission } from "@/lib/dal/submissions";

// POST /api/projects/:projectId/submissions/:submissionId/receive — lab intake with per-bag condition and location (lead, lab analyst)
export const POST = withActor<{ projectId: string; submissionId: string }>({ permission: "lab.intake" }, async ({ req, params, actor }) => receiveSubmission(actor, params.projectId, params.submissionId, await parseJson(req)));

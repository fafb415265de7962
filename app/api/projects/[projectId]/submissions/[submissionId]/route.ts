import { withActor } from "@/lib/api/handler";
import { getSubmissionOrThrow } from "@/lib/dal/submissions";

// GET /api/projects/:projectId/submissions/:submissionId — a submission with its samples and custody events (any member)
export const GET = withActor<{ projectId: string; submissionId: string }>(async ({ params, actor }) => getSubmissionOrThrow(actor, params.projectId, params.submissionId));

import { withActor } from "@/lib/api/handler";
import { listLabLinks, revokeLabLinks } from "@/lib/dal/lab-links";

// GET /api/projects/:projectId/submissions/:submissionId/lab-link — the lab links e-mailed for this submission, with their state (lead, field geologist)
export const GET = withActor<{ projectId: string; submissionId: string }>({ permission: "submission.write" }, async ({ params, actor }) => ({ items: await listLabLinks(actor, params.projectId, params.submissionId) }));

// DELETE /api/projects/:projectId/submissions/:submissionId/lab-link — withdraw the active lab link now (the lab gets 410; a resend issues a new one)
export const DELETE = withActor<{ projectId: string; submissionId: string }>({ permission: "submission.write" }, async ({ params, actor }) => revokeLabLinks(actor, params.projectId, params.submissionId));

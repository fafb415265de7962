import { withActor } from "@/lib/api/handler";
import { listSignOffs } from "@/lib/dal/scan-review";

// GET /api/projects/:projectId/scans/:scanId/sign-offs — every sign-off version of the scan, newest first, with reopen reasons (any member)
export const GET = withActor<{ projectId: string; scanId: string }>({ permission: "project.read" }, async ({ actor, params }) => listSignOffs(actor, params.projectId, params.scanId));

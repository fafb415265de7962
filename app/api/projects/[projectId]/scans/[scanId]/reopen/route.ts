import { parseJson, withActor } from "@/lib/api/handler";
import { reopenScan } from "@/lib/dal/scan-review";

// POST /api/projects/:projectId/scans/:scanId/reopen — {reason}: reopen a sign-off (a lead, a site admin or the signing analyst; the DAL checks who); the earlier sign-off stays in the history
export const POST = withActor<{ projectId: string; scanId: string }>({ permission: "project.read" }, async ({ actor, params, req }) => reopenScan(actor, params.projectId, params.scanId, await parseJson(req)));

import { parseJson, withActor } from "@/lib/api/handler";
import { signOffScan } from "@/lib/dal/scan-review";

// POST /api/projects/:projectId/scans/:scanId/sign-off — confirm the accepted phases of the current run and lock the scan, body {confirm: true, note?} (lab analyst)
export const POST = withActor<{ projectId: string; scanId: string }>({ permission: "phase.review" }, async ({ actor, params, req }) => signOffScan(actor, params.projectId, params.scanId, await parseJson(req)));

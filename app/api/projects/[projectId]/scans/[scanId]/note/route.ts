import { parseJson, withActor } from "@/lib/api/handler";
import { updateScanNote } from "@/lib/dal/scan-review";

// PATCH /api/projects/:projectId/scans/:scanId/note — set the analyst's note, body {note} (lab analyst)
export const PATCH = withActor<{ projectId: string; scanId: string }>({ permission: "phase.review" }, async ({ actor, params, req }) => updateScanNote(actor, params.projectId, params.scanId, await parseJson(req)));

import { parseJson, withActor } from "@/lib/api/handler";
import { decidePhase } from "@/lib/dal/scan-review";

// PATCH /api/projects/:projectId/scans/:scanId/phases/:phaseId — accept, reject or reset a candidate, body {status, note?} (lab analyst)
export const PATCH = withActor<{ projectId: string; scanId: string; phaseId: string }>({ permission: "phase.review" }, async ({ actor, params, req }) =>
  decidePhase(actor, params.projectId, params.scanId, params.phaseId, await parseJson(req)),
);

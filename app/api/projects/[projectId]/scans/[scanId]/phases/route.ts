import { created, parseJson, withActor } from "@/lib/api/handler";
import { addManualPhase } from "@/lib/dal/scan-review";

// POST /api/projects/:projectId/scans/:scanId/phases — add a phase from the reference library to the current run, body {referencePhaseId, note?} (lab analyst)
export const POST = withActor<{ projectId: string; scanId: string }>({ permission: "phase.review" }, async ({ actor, params, req }) =>
  created(await addManualPhase(actor, params.projectId, params.scanId, await parseJson(req))),
);

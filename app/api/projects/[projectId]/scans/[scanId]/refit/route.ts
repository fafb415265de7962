import { created, parseJson, withActor } from "@/lib/api/handler";
import { refitScan } from "@/lib/dal/scan-review";

// POST /api/projects/:projectId/scans/:scanId/refit — fit the whole pattern with exactly the analyst's phases, body {phaseIds: string[]} (1–10 reference phase ids); the fit becomes a new current run, earlier runs are kept (lab analyst)
export const POST = withActor<{ projectId: string; scanId: string }>({ permission: "phase.review" }, async ({ actor, params, req }) =>
  created(await refitScan(actor, params.projectId, params.scanId, await parseJson(req))),
);

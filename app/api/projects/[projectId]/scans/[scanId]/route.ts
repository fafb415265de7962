import { parseJson, withActor } from "@/lib/api/handler";
import { getScanOrThrow, selectScanRun } from "@/lib/dal/scans";

type P = { projectId: string; scanId: string };

// GET /api/projects/:projectId/scans/:scanId?run= — the scan, its runs, and the selected run's curves, peaks and candidates (any member)
export const GET = withActor<P>(async ({ actor, params, url }) => getScanOrThrow(actor, params.projectId, params.scanId, url.searchParams.get("run") || null));

// PATCH /api/projects/:projectId/scans/:scanId — make an earlier finished run current, body {currentRunId} (lab analyst)
export const PATCH = withActor<P>({ permission: "phase.review" }, async ({ actor, params, req }) => selectScanRun(actor, params.projectId, params.scanId, await parseJson(req)));

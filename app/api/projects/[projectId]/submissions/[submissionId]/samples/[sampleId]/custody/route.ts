import { created, parseJson, withActor } from "@/lib/api/handler";
import { recordCustodySteps } from "@/lib/dal/custody";

// POST /api/projects/:projectId/submissions/:submissionId/samples/:sampleId/custody — one custody step (prepared, scanned, stored, returned, discarded, late received; lead, lab analyst) or a hand-over (transferred; lead, field geologist, lab analyst)
export const POST = withActor<{ projectId: string; submissionId: string; sampleId: string }>({ permission: "custody.write" }, async ({ req, params, actor }) =>
  created(await recordCustodySteps(actor, params.projectId, params.submissionId, await parseJson(req), params.sampleId)),
);

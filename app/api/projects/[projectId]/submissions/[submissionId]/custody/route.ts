import { created, parseJson, withActor } from "@/lib/api/handler";
import { recordCustodySteps } from "@/lib/dal/custody";

// POST /api/projects/:projectId/submissions/:submissionId/custody — one custody step for several samples, all or nothing (lab steps: lead, lab analyst; hand-over: lead, field geologist, lab analyst)
export const POST = withActor<{ projectId: string; submissionId: string }>({ permission: "custody.write" }, async ({ req, params, actor }) =>
  created(await recordCustodySteps(actor, params.projectId, params.submissionId, await parseJson(req))),
);

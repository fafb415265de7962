import { created, parseJson, withActor } from "@/lib/api/handler";
import { listSampleCustody, recordSampleEvent } from "@/lib/dal/custody";

// GET /api/projects/:projectId/samples/:sampleId/custody — the sample's chain of custody, oldest first (any member)
export const GET = withActor<{ projectId: string; sampleId: string }>(async ({ params, actor }) => listSampleCustody(actor, params.projectId, params.sampleId));

// POST /api/projects/:projectId/samples/:sampleId/custody — {event: "collected"} for a planned sample (sample.write), or
// {event: "received_directly", note} when the project's lab is in-house (lab.intake); the status follows the event
export const POST = withActor<{ projectId: string; sampleId: string }>({ permission: "custody.write" }, async ({ req, params, actor }) =>
  created(await recordSampleEvent(actor, params.projectId, params.sampleId, await parseJson(req))),
);

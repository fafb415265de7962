import { withActor } from "@/lib/api/handler";
import { listSampleCustody } from "@/lib/dal/custody";

// GET /api/projects/:projectId/samples/:sampleId/custody — the sample's chain of custody, oldest first (any member)
export const GET = withActor<{ projectId: string; sampleId: string }>(async ({ params, actor }) => listSampleCustody(actor, params.projectId, params.sampleId));

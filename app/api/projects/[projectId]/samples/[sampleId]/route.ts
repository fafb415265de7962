import { parseJson, withActor } from "@/lib/api/handler";
import { getSampleOrThrow, updateSample } from "@/lib/dal/samples";

type P = { projectId: string; sampleId: string };

// GET /api/projects/:projectId/samples/:sampleId — one sample (any member)
export const GET = withActor<P>(async ({ actor, params }) => getSampleOrThrow(actor, params.projectId, params.sampleId));

// PATCH /api/projects/:projectId/samples/:sampleId — edit with optimistic concurrency (lead, field geologist)
export const PATCH = withActor<P>({ permission: "sample.write" }, async ({ actor, params, req }) =>
  updateSample(actor, params.projectId, params.sampleId, await parseJson(req)),
);

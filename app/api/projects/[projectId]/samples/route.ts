import { created, parseJson, parseQuery, withActor } from "@/lib/api/handler";
import { createSample, listSamples } from "@/lib/dal/samples";
import { DEVICE_HEADER } from "@/lib/outbox/code-block-math";
import { sampleListQuerySchema } from "@/lib/validation/sample";

// GET /api/projects/:projectId/samples — one page of the register (any member)
export const GET = withActor<{ projectId: string }>(async ({ actor, params, url }) =>
  listSamples(actor, params.projectId, parseQuery(url, sampleListQuerySchema)),
);

// POST /api/projects/:projectId/samples — create a sample; replay-safe with a client id / Idempotency-Key; a reserved code only from its device (lead, field geologist)
export const POST = withActor<{ projectId: string }>({ permission: "sample.write" }, async ({ actor, params, req }) =>
  created(await createSample(actor, params.projectId, await parseJson(req), { idempotencyKey: req.headers.get("idempotency-key"), deviceId: req.headers.get(DEVICE_HEADER) })),
);

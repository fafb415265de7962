import { created, parseJson, withActor } from "@/lib/api/handler";
import { listCodeBlocks, reserveCodeBlock } from "@/lib/dal/code-blocks";

type P = { projectId: string };

// GET /api/projects/:projectId/sample-code-blocks?deviceId=… — the caller's reserved code blocks on one device (lead, field geologist)
export const GET = withActor<P>({ permission: "sample.write" }, async ({ actor, params, url }) => ({ items: await listCodeBlocks(actor, params.projectId, url.searchParams.get("deviceId")) }));

// POST /api/projects/:projectId/sample-code-blocks — reserve the next block of sample codes for a device; replay-safe with an Idempotency-Key (lead, field geologist)
export const POST = withActor<P>({ permission: "sample.write" }, async ({ actor, params, req }) =>
  created(await reserveCodeBlock(actor, params.projectId, await parseJson(req), { idempotencyKey: req.headers.get("idempotency-key") })),
);

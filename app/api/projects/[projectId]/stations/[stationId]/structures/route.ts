import { created, parseJson, withActor } from "@/lib/api/handler";
import { createStructure, listStructures } from "@/lib/dal/structures";

type P = { projectId: string; stationId: string };

// GET /api/projects/:projectId/stations/:stationId/structures — structural measurements of a station (any member)
export const GET = withActor<P>(async ({ actor, params }) => ({ items: await listStructures(actor, params.projectId, params.stationId) }));

// POST /api/projects/:projectId/stations/:stationId/structures — add a plane or line measurement (lead, field geologist)
export const POST = withActor<P>({ permission: "station.write" }, async ({ actor, params, req }) => created(await createStructure(actor, params.projectId, params.stationId, await parseJson(req), { idempotencyKey: req.headers.get("idempotency-key") })));

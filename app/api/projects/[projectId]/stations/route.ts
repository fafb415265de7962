import { created, parseJson, withActor } from "@/lib/api/handler";
import { createStation, listStations } from "@/lib/dal/stations";

type P = { projectId: string };

// GET /api/projects/:projectId/stations — all stations with sample/structure/photo counts (any member)
export const GET = withActor<P>(async ({ actor, params, url }) => listStations(actor, params.projectId, Object.fromEntries(url.searchParams)));

// POST /api/projects/:projectId/stations — create a station; code from the station sequence when omitted; replay-safe with a client id / Idempotency-Key (lead, field geologist)
export const POST = withActor<P>({ permission: "station.write" }, async ({ actor, params, req }) => created(await createStation(actor, params.projectId, await parseJson(req), { idempotencyKey: req.headers.get("idempotency-key") })));

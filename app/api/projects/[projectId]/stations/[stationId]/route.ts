import { parseJson, withActor } from "@/lib/api/handler";
import { getStationOrThrow, updateStation } from "@/lib/dal/stations";

type P = { projectId: string; stationId: string };

// GET /api/projects/:projectId/stations/:stationId — one station with its structures and samples (any member)
export const GET = withActor<P>(async ({ actor, params }) => getStationOrThrow(actor, params.projectId, params.stationId));

// PATCH /api/projects/:projectId/stations/:stationId — edit or move with optimistic concurrency (lead, field geologist)
export const PATCH = withActor<P>({ permission: "station.write" }, async ({ actor, params, req }) => updateStation(actor, params.projectId, params.stationId, await parseJson(req)));

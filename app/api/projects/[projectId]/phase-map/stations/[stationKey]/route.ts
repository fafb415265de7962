import { withActor } from "@/lib/api/handler";
import { getPhaseMapStation } from "@/lib/dal/phase-map";
import { queryObject } from "@/lib/phase-map";

// GET /api/projects/:projectId/phase-map/stations/:stationKey?<filters> — one station's matching samples with phases and scans (any member)
export const GET = withActor<{ projectId: string; stationKey: string }>(async ({ actor, params, url }) =>
  getPhaseMapStation(actor, params.projectId, decodeURIComponent(params.stationKey), queryObject(url.searchParams)),
);

import { withActor } from "@/lib/api/handler";
import { AppError } from "@/lib/dal/errors";
import { getPhaseMapStation } from "@/lib/dal/phase-map";
import { queryObject } from "@/lib/phase-map";

/** The station key as sent (Next decoded the path once; keys may carry an encoded "/" or "%"). A bad escape is a 400. */
function decodeKey(raw: string): string {
  try {
    return decodeURIComponent(raw);
  } catch {
    throw new AppError("bad_request", "The station key in the address is not valid (a stray % escape).");
  }
}

// GET /api/projects/:projectId/phase-map/stations/:stationKey?<filters> — one station's matching samples with phases and scans (any member)
// The access check comes first: a bad key is a 400 only for members, a 404 for everyone else.
export const GET = withActor<{ projectId: string; stationKey: string }>({ permission: "project.read" }, async ({ actor, params, url }) =>
  getPhaseMapStation(actor, params.projectId, decodeKey(params.stationKey), queryObject(url.searchParams)),
);

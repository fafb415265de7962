import { withActor } from "@/lib/api/handler";
import { getPhaseMap } from "@/lib/dal/phase-map";
import { queryObject } from "@/lib/phase-map";

// GET /api/projects/:projectId/phase-map?<register filters>&mineral=&group=&phase=confirmed|any|candidate&leading= — stations with their confirmed phases and leading candidates (any member)
export const GET = withActor<{ projectId: string }>(async ({ actor, params, url }) => getPhaseMap(actor, params.projectId, queryObject(url.searchParams)));

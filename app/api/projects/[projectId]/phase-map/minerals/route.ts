import { withActor } from "@/lib/api/handler";
import { getPhaseMapMinerals } from "@/lib/dal/phase-map";
import { queryObject } from "@/lib/phase-map";

// GET /api/projects/:projectId/phase-map/minerals?<register filters> — minerals found, with confirmed / candidate-only station counts (any member)
export const GET = withActor<{ projectId: string }>(async ({ actor, params, url }) => ({ items: await getPhaseMapMinerals(actor, params.projectId, queryObject(url.searchParams)) }));

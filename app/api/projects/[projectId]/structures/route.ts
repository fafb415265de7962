import { withActor } from "@/lib/api/handler";
import { listProjectStructures } from "@/lib/dal/structures";

// GET /api/projects/:projectId/structures — every structural measurement with its station's position, for the map (any member)
export const GET = withActor<{ projectId: string }>(async ({ actor, params }) => ({ items: await listProjectStructures(actor, params.projectId) }));

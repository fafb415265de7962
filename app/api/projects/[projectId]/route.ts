import { withActor } from "@/lib/api/handler";
import { getProjectOverview } from "@/lib/dal/projects";

// GET /api/projects/:projectId — project, counts and members (any member)
export const GET = withActor<{ projectId: string }>(async ({ actor, params }) => getProjectOverview(actor, params.projectId));

import { withActor } from "@/lib/api/handler";
import { listProjects } from "@/lib/dal/projects";

// GET /api/projects — projects the caller is a member of, with the caller's role
export const GET = withActor(async ({ actor }) => ({ items: await listProjects(actor) }));

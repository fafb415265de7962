import { created, parseJson, withActor } from "@/lib/api/handler";
import { createProject, listProjects } from "@/lib/dal/projects";

// GET /api/projects — projects the caller is a member of, with the caller's role
export const GET = withActor(async ({ actor }) => ({ items: await listProjects(actor) }));

// POST /api/projects — create a project; the creator becomes its lead (site admin, or anyone when LITHODEX_OPEN_PROJECTS=1)
export const POST = withActor(async ({ actor, req }) => created(await createProject(actor, await parseJson(req))));

import { parseJson, withActor } from "@/lib/api/handler";
import { getProjectOverview, updateProject } from "@/lib/dal/projects";

// GET /api/projects/:projectId — project, counts and members (any member)
export const GET = withActor<{ projectId: string }>(async ({ actor, params }) => getProjectOverview(actor, params.projectId));

// PATCH /api/projects/:projectId — settings (name, code while no samples, region, description, zone, lab, scan defaults, code pattern) with version (lead)
export const PATCH = withActor<{ projectId: string }>({ permission: "project.manage" }, async ({ actor, params, req }) => updateProject(actor, params.projectId, await parseJson(req)));

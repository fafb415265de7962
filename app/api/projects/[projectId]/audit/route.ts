import { withActor } from "@/lib/api/handler";
import { auditFacets, listAudit } from "@/lib/dal/audit-log";

// GET /api/projects/:projectId/audit?entity=&entityId=&actorId=&action=&from=&to=&page=&pageSize= — the audit log,
// newest first, with before/after per field and the filter menus (audit.read: lead, consultant, site admin)
export const GET = withActor<{ projectId: string }>({ permission: "audit.read" }, async ({ params, actor, url }) => {
  const query = Object.fromEntries([...url.searchParams].filter(([, v]) => v !== ""));
  const [page, facets] = await Promise.all([listAudit(actor, params.projectId, query), auditFacets(actor, params.projectId)]);
  return { ...page, facets };
});

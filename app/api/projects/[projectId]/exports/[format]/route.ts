import { withActor } from "@/lib/api/handler";
import { prepareRegisterExport } from "@/lib/dal/register-export";
import { exportResponse, parseExportFormat } from "@/lib/export/respond";
import { queryObject } from "@/lib/phase-map";

// GET /api/projects/:projectId/exports/:format?<register filters>&mineral=&group=&phase=&leading= — the filtered register as csv, xlsx, geojson, kml or pdf, streamed (any member, export.read)
export const GET = withActor<{ projectId: string; format: string }>(async ({ actor, params, url }) => {
  // Access and filter are checked first (a non-member gets 404 whatever the format), then the format.
  const exp = await prepareRegisterExport(actor, params.projectId, queryObject(url.searchParams));
  const format = parseExportFormat(params.format);
  return exportResponse(exp, format, { sampleUrl: (id) => `${url.origin}/projects/${params.projectId}/samples/${id}` });
});

import { withActor } from "@/lib/api/handler";
import { prepareRegisterExport } from "@/lib/dal/register-export";
import { exportResponse, parseExportFormat } from "@/lib/export/respond";
import { queryObject } from "@/lib/phase-map";

// GET /api/projects/:projectId/samples/export?format=csv|geojson&<register filters> — the filtered register as CSV or GeoJSON, streamed (any member).
// The register's original export URL; it goes through the same export path as /exports/:format (one filter parser, one access check).
export const GET = withActor<{ projectId: string }>(async ({ actor, params, url }) => {
  const query = queryObject(url.searchParams);
  delete query.format;
  delete query.download;
  const exp = await prepareRegisterExport(actor, params.projectId, query);
  const format = parseExportFormat(url.searchParams.get("format") || "csv", ["csv", "geojson"]);
  return exportResponse(exp, format, { sampleUrl: (id) => `${url.origin}/projects/${params.projectId}/samples/${id}` });
});

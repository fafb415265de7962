import { errorResponse } from "@/lib/api/handler";
import { prepareSharedExport } from "@/lib/dal/share-links";
import { exportResponse, parseExportFormat } from "@/lib/export/respond";

// GET /api/share/:token/export/:format — the shared register as csv, xlsx, geojson, kml or pdf (no account; unknown 404, revoked or expired 410)
export async function GET(_req: Request, ctx: { params: Promise<{ token: string; format: string }> }): Promise<Response> {
  try {
    const { token, format } = await ctx.params;
    const exp = await prepareSharedExport(token);
    return exportResponse(exp, parseExportFormat(format), { sampleUrl: null });
  } catch (err) {
    return errorResponse(err);
  }
}

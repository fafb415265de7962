import { withActor } from "@/lib/api/handler";
import { AppError } from "@/lib/dal/errors";
import { reprocessScan } from "@/lib/dal/scans";

// POST /api/projects/:projectId/scans/:scanId/process — queue a new run with processing/identification parameters; earlier runs are kept (lab analyst)
export const POST = withActor<{ projectId: string; scanId: string }>(async ({ actor, params, req }) => {
  const text = await req.text();
  let body: unknown = {};
  if (text.trim()) {
    try {
      body = JSON.parse(text);
    } catch {
      throw new AppError("bad_request", "The request body is not valid JSON.");
    }
  }
  return Response.json(await reprocessScan(actor, params.projectId, params.scanId, body), { status: 202 });
});

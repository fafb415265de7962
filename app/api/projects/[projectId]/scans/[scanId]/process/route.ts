import { bodyRuleOf, isJsonType, mediaType, readLimitedBytes } from "@/lib/api/body";
import { withActor } from "@/lib/api/handler";
import { AppError } from "@/lib/dal/errors";
import { reprocessScan } from "@/lib/dal/scans";

// POST /api/projects/:projectId/scans/:scanId/process — queue a new run with processing/identification parameters; earlier runs are kept (lab analyst)
export const POST = withActor<{ projectId: string; scanId: string }>({ permission: "scan.write" }, async ({ actor, params, req }) => {
  // An empty body means "default settings"; anything else must be JSON (415 otherwise) within the route's 1 MiB limit.
  const bytes = await readLimitedBytes(req, bodyRuleOf(req) ?? { kind: "json", maxBytes: 1024 * 1024 });
  const text = new TextDecoder().decode(bytes);
  let body: unknown = {};
  if (text.trim()) {
    if (!isJsonType(mediaType(req))) throw new AppError("unsupported_media_type", "Send the body as JSON (content-type application/json).");
    try {
      body = JSON.parse(text);
    } catch {
      throw new AppError("bad_request", "The request body is not valid JSON.");
    }
  }
  return Response.json(await reprocessScan(actor, params.projectId, params.scanId, body), { status: 202 });
});

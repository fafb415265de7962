import { BODY_LIMITS } from "@/lib/api/body";
import { created, withActor } from "@/lib/api/handler";
import { AppError } from "@/lib/dal/errors";
import { cleanFileName } from "@/lib/storage/file-name";
import { createTilePackage, listTilePackages } from "@/lib/dal/tile-packages";

// GET /api/projects/:projectId/tile-packages — the project's MBTiles map layers (any member)
export const GET = withActor<{ projectId: string }>(async ({ actor, params }) => listTilePackages(actor, params.projectId));

// POST /api/projects/:projectId/tile-packages — upload an MBTiles file as the raw request body; name via x-filename (lead, field geologist)
export const POST = withActor<{ projectId: string }>({ permission: "tiles.manage", body: { kind: "raw", maxBytes: BODY_LIMITS.tiles, label: "an MBTiles package" } }, async ({ actor, params, req }) => {
  if ((req.headers.get("content-type") ?? "").startsWith("multipart/")) {
    throw new AppError("unsupported_media_type", "Send the .mbtiles file as the raw request body (content-type application/vnd.sqlite3), not as a form.");
  }
  const raw = req.headers.get("x-filename");
  let filename: string | null = null;
  try {
    filename = raw ? cleanFileName(decodeURIComponent(raw)) : null;
  } catch {
    filename = raw ? cleanFileName(raw) : null;
  }
  return created(await createTilePackage(actor, params.projectId, { body: req.body, filename }));
});

import { withActor } from "@/lib/api/handler";
import { readPhotoVariant } from "@/lib/dal/photos";
import { notFound } from "@/lib/dal/errors";
import { contentDisposition } from "@/lib/storage/file-name";
import { PHOTO_VARIANTS, type PhotoVariantName } from "@/lib/validation/photo";

type P = { projectId: string; photoId: string; variant: string };


// GET /api/projects/:projectId/photos/:photoId/:variant — bytes of original | thumb | display, cached privately, ETag/304 (any member)
export const GET = withActor<P>(async ({ actor, params, req }) => {
  if (!(PHOTO_VARIANTS as readonly string[]).includes(params.variant)) throw notFound(`Unknown rendition "${params.variant}"; use original, thumb or display.`);
  const v = await readPhotoVariant(actor, params.projectId, params.photoId, params.variant as PhotoVariantName);
  const headers = new Headers({
    "content-type": v.mime,
    etag: v.etag,
    // Photo bytes never change under an id; private because access depends on project membership.
    "cache-control": "private, max-age=31536000, immutable",
    "x-content-type-options": "nosniff",
    "content-disposition": contentDisposition(v.fileName, "inline"),
  });
  if (req.headers.get("if-none-match") === v.etag) return new Response(null, { status: 304, headers });
  headers.set("content-length", String(v.size));
  return new Response(await v.open(), { status: 200, headers });
});

import { parseJson, withActor } from "@/lib/api/handler";
import { deletePhoto, getPhotoOrThrow, updatePhoto } from "@/lib/dal/photos";

type P = { projectId: string; photoId: string };

// GET /api/projects/:projectId/photos/:photoId — photo metadata (EXIF time, GPS, direction) and rendition URLs (any member)
export const GET = withActor<P>(async ({ actor, params }) => getPhotoOrThrow(actor, params.projectId, params.photoId));

// PATCH /api/projects/:projectId/photos/:photoId — edit the caption (lead, field geologist)
export const PATCH = withActor<P>({ permission: "sample.write" }, async ({ actor, params, req }) => updatePhoto(actor, params.projectId, params.photoId, await parseJson(req)));

// DELETE /api/projects/:projectId/photos/:photoId — delete a photo and its files (lead, field geologist)
export const DELETE = withActor<P>({ permission: "sample.write" }, async ({ actor, params }) => {
  await deletePhoto(actor, params.projectId, params.photoId);
  return new Response(null, { status: 204 });
});

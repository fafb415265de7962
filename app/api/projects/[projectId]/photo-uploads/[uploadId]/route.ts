import { BODY_LIMITS } from "@/lib/api/body";
import { withActor } from "@/lib/api/handler";
import { handlePhotoUpload } from "@/lib/api/resumable-photos";

type P = { projectId: string; uploadId: string };

// HEAD /api/projects/:projectId/photo-uploads/:uploadId — how many bytes the server holds (Upload-Offset), to resume from there (the account that opened it)
export const HEAD = withActor<P>({ permission: "sample.write" }, async ({ actor, params, req }) => handlePhotoUpload(req, actor, params.projectId, params.uploadId));

// PATCH /api/projects/:projectId/photo-uploads/:uploadId — append a chunk at Upload-Offset (application/offset+octet-stream);
// the last one stores the photo (sniffing, EXIF, renditions, SHA-256, one transaction) and answers with it (the account that opened it)
export const PATCH = withActor<P>({ permission: "sample.write", body: { kind: "raw", maxBytes: BODY_LIMITS.photo, label: "a photo upload chunk" } }, async ({ actor, params, req }) =>
  handlePhotoUpload(req, actor, params.projectId, params.uploadId),
);

// DELETE /api/projects/:projectId/photo-uploads/:uploadId — cancel an unfinished upload and drop its partial file (the account that opened it)
export const DELETE = withActor<P>({ permission: "sample.write" }, async ({ actor, params, req }) => handlePhotoUpload(req, actor, params.projectId, params.uploadId));

import { BODY_LIMITS } from "@/lib/api/body";
import { created, withActor } from "@/lib/api/handler";
import { MAX_PHOTOS_PER_UPLOAD, listPhotos, uploadPhotos } from "@/lib/dal/photos";
import { readUploadFiles } from "@/lib/photos/upload-request";

type P = { projectId: string; sampleId: string };

// GET /api/projects/:projectId/samples/:sampleId/photos — photos of a sample with distance to its station (any member)
export const GET = withActor<P>(async ({ actor, params }) => listPhotos(actor, params.projectId, { sampleId: params.sampleId }));

// POST /api/projects/:projectId/samples/:sampleId/photos — upload one or more photos, multipart field "files"; all or nothing (lead, field geologist)
export const POST = withActor<P>({ permission: "sample.write", body: { kind: "multipart", maxBytes: BODY_LIMITS.photo, label: "a photo upload" } }, async ({ actor, params, req }) =>
  created(await uploadPhotos(actor, params.projectId, { sampleId: params.sampleId }, () => readUploadFiles(req, { maxFiles: MAX_PHOTOS_PER_UPLOAD }))),
);

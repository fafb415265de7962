import { BODY_LIMITS } from "@/lib/api/body";
import { created, withActor } from "@/lib/api/handler";
import { MAX_PHOTOS_PER_UPLOAD, listPhotos, uploadPhotos } from "@/lib/dal/photos";
import { readUploadFiles } from "@/lib/photos/upload-request";

type P = { projectId: string; stationId: string };

// GET /api/projects/:projectId/stations/:stationId/photos — photos of a station (any member)
export const GET = withActor<P>(async ({ actor, params }) => listPhotos(actor, params.projectId, { stationId: params.stationId }));

// POST /api/projects/:projectId/stations/:stationId/photos — upload one or more photos, multipart field "files" (lead, field geologist)
export const POST = withActor<P>({ permission: "station.write", body: { kind: "multipart", maxBytes: BODY_LIMITS.photo, label: "a photo upload" } }, async ({ actor, params, req }) =>
  created(await uploadPhotos(actor, params.projectId, { stationId: params.stationId }, () => readUploadFiles(req, { maxFiles: MAX_PHOTOS_PER_UPLOAD }))),
);

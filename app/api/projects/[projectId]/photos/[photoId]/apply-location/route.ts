import { parseJson, withActor } from "@/lib/api/handler";
import { applyPhotoLocation } from "@/lib/dal/photos";

type P = { projectId: string; photoId: string };

// POST /api/projects/:projectId/photos/:photoId/apply-location — copy the photo's EXIF position onto its sample; body {version, includeElevation?} (lead, field geologist)
export const POST = withActor<P>({ permission: "sample.write" }, async ({ actor, params, req }) => applyPhotoLocation(actor, params.projectId, params.photoId, await parseJson(req)));

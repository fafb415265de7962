import { withActor } from "@/lib/api/handler";
import { handlePhotoUpload } from "@/lib/api/resumable-photos";

type P = { projectId: string };

// POST /api/projects/:projectId/photo-uploads — open a resumable photo upload (tus 1.0.0 creation: Upload-Length,
// Upload-Metadata clientPhotoId + sampleId or stationId + filename); 201 with the session's Location (lead, field geologist)
export const POST = withActor<P>({ permission: "sample.write" }, async ({ actor, params, req }) => handlePhotoUpload(req, actor, params.projectId, null));

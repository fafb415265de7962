import { readMultipart } from "@/app/api/projects/[projectId]/scans/multipart";
import { withActor } from "@/lib/api/handler";
import { importReferenceCifs } from "@/lib/dal/reference-phases";

// POST /api/reference-phases/import — import CIF files (multipart: files); per-file errors for CIFs that cannot be used (lab analyst in any project, site admin)
export const POST = withActor(async ({ actor, req }) => {
  const { files } = await readMultipart(req);
  return Response.json(await importReferenceCifs(actor, files), { status: 201 });
});

import { readMultipart } from "@/app/api/projects/[projectId]/scans/multipart";
import { BODY_LIMITS } from "@/lib/api/body";
import { withActor } from "@/lib/api/handler";
import { forbidden } from "@/lib/dal/errors";
import { canImportReferences, importReferenceCifs } from "@/lib/dal/reference-phases";

// POST /api/reference-phases/import — import CIF files (multipart: files); per-file errors for CIFs that cannot be used (lab analyst in any project, site admin)
// The role is checked before the body is read; the body may be at most 2 MiB (all files together).
export const POST = withActor(
  {
    access: async (actor) => {
      if (!(await canImportReferences(actor))) throw forbidden("Only lab analysts and site admins can import reference structures.");
    },
    body: { kind: "multipart", maxBytes: BODY_LIMITS.cif, label: "a CIF import" },
  },
  async ({ actor, req }) => {
    const { files } = await readMultipart(req);
    return Response.json(await importReferenceCifs(actor, files), { status: 201 });
  },
);

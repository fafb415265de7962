import { withActor } from "@/lib/api/handler";
import { getReferenceCif } from "@/lib/dal/reference-phases";

// GET /api/reference-phases/:referenceId/cif — the stored CIF text (any signed-in user)
export const GET = withActor<{ referenceId: string }>(async ({ actor, params }) => {
  const r = await getReferenceCif(actor, params.referenceId);
  return new Response(r.cif, { headers: { "content-type": "chemical/x-cif; charset=utf-8", "content-disposition": `attachment; filename="${r.mineral.replace(/[^a-z0-9-]+/gi, "_")}.cif"` } });
});

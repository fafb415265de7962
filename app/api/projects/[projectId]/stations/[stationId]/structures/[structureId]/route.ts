import { parseJson, withActor } from "@/lib/api/handler";
import { deleteStructure, updateStructure } from "@/lib/dal/structures";

type P = { projectId: string; stationId: string; structureId: string };

// DELETE /api/projects/:projectId/stations/:stationId/structures/:structureId — remove a measurement (lead, field geologist)
export const DELETE = withActor<P>({ permission: "station.write" }, async ({ actor, params }) => {
  await deleteStructure(actor, params.projectId, params.stationId, params.structureId);
  return new Response(null, { status: 204 });
});

// PATCH /api/projects/:projectId/stations/:stationId/structures/:structureId — re-enter a measurement with optimistic concurrency (lead, field geologist)
export const PATCH = withActor<P>({ permission: "station.write" }, async ({ actor, params, req }) =>
  updateStructure(actor, params.projectId, params.stationId, params.structureId, await parseJson(req)),
);

import { withActor } from "@/lib/api/handler";
import { getReferencePhaseOrThrow } from "@/lib/dal/reference-phases";

// GET /api/reference-phases/:referenceId?anode=|wavelength=&twoThetaMax= — one phase with its calculated pattern for any anode (any signed-in user)
export const GET = withActor<{ referenceId: string }>(async ({ actor, params, url }) =>
  getReferencePhaseOrThrow(actor, params.referenceId, Object.fromEntries([...url.searchParams.entries()].filter(([, v]) => v !== ""))),
);

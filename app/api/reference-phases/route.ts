import { withActor } from "@/lib/api/handler";
import { listReferencePhases } from "@/lib/dal/reference-phases";

// GET /api/reference-phases?q=&hazard=&element=&source= — the reference library, shipped and imported (any signed-in user)
export const GET = withActor(async ({ actor, url }) => listReferencePhases(actor, Object.fromEntries([...url.searchParams.entries()].filter(([, v]) => v !== ""))));

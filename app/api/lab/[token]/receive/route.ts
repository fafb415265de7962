import { parseJson } from "@/lib/api/handler";
import { withToken } from "@/lib/api/public";
import { labReceive, resolveLabToken } from "@/lib/dal/lab-links";

// POST /api/lab/:token/receive — the outside lab records the intake of the manifest's bags ({receivedBy, items, labReference…}; no "extra" bags)
export const POST = withToken<{ token: string }>({ check: (p) => resolveLabToken(p.token) }, async ({ req, params }) => labReceive(params.token, await parseJson(req)));

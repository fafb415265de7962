import { withToken } from "@/lib/api/public";
import { getLabView, resolveLabToken } from "@/lib/dal/lab-links";

// GET /api/lab/:token — an outside lab's view of its one submission: manifest, intake state, scans (no account; unknown 404, revoked or expired 410)
export const GET = withToken<{ token: string }>({ check: (p) => resolveLabToken(p.token) }, async ({ params }) => getLabView(params.token));

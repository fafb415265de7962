import { assertSameOrigin, errorResponse, parseJson } from "@/lib/api/handler";
import { getPasswordLink, redeemPasswordLink } from "@/lib/dal/users";

// GET /api/password-links/:token — whose password the link sets (public: the token is the credential; unknown 404, used or expired 410)
export async function GET(_req: Request, ctx: { params: Promise<{ token: string }> }): Promise<Response> {
  try {
    return Response.json(await getPasswordLink((await ctx.params).token));
  } catch (err) {
    return errorResponse(err);
  }
}

// POST /api/password-links/:token — {password}: set the password (rules of lib/security/password.ts), single use; ends every session
export async function POST(req: Request, ctx: { params: Promise<{ token: string }> }): Promise<Response> {
  try {
    assertSameOrigin(req);
    const { token } = await ctx.params;
    await getPasswordLink(token);
    return Response.json(await redeemPasswordLink(token, await parseJson(req)));
  } catch (err) {
    return errorResponse(err);
  }
}

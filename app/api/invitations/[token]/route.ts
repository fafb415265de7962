import { NextResponse } from "next/server";
import { assertSameOrigin, errorResponse, parseJson } from "@/lib/api/handler";
import { acceptInvitation, getInvitationByToken } from "@/lib/dal/invitations";

type Ctx = { params: Promise<{ token: string }> };

// GET /api/invitations/:token — what an invitation is for (public; 404 unknown, 410 used or expired)
export async function GET(_req: Request, ctx: Ctx) {
  try {
    return NextResponse.json(await getInvitationByToken((await ctx.params).token));
  } catch (err) {
    return errorResponse(err);
  }
}

// POST /api/invitations/:token — accept: a new account sets name and password, an existing one joins (public; single use)
export async function POST(req: Request, ctx: Ctx) {
  try {
    assertSameOrigin(req);
    const { token } = await ctx.params;
    return NextResponse.json(await acceptInvitation(token, await parseJson(req)));
  } catch (err) {
    return errorResponse(err);
  }
}

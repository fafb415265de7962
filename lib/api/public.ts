import "server-only";
import { NextResponse } from "next/server";
import { SAFE_METHODS } from "@/lib/security/origin";
import { BODY_LIMITS, limitBody, type BodyRule } from "./body";
import { assertSameOrigin, errorResponse } from "./handler";

/**
 * Wraps a route that a token opens instead of a session (an outside lab's link): resolves params, runs `check`
 * (the token: 404 unknown, 410 revoked or expired) before any body byte is read, checks Origin on state-changing
 * methods and the body's media type and size, and maps errors to the one JSON shape.
 */
export function withToken<P extends Record<string, string>>(
  options: { check: (params: P) => Promise<unknown>; body?: BodyRule },
  fn: (ctx: { req: Request; params: P; url: URL }) => Promise<Response | unknown>,
): (req: Request, ctx: { params: Promise<P> }) => Promise<Response> {
  return async (req, ctx) => {
    try {
      const params = await ctx.params;
      const unsafe = !SAFE_METHODS.has(req.method.toUpperCase());
      if (unsafe) assertSameOrigin(req);
      await options.check(params);
      const limited = unsafe ? limitBody(req, options.body ?? { kind: "json", maxBytes: BODY_LIMITS.json, label: "a JSON request" }) : req;
      const out = await fn({ req: limited, params, url: new URL(req.url) });
      return out instanceof Response ? out : NextResponse.json(out);
    } catch (err) {
      return errorResponse(err);
    }
  };
}

/** A PDF download (no caching, no referrer leaking the token). */
export function pdfResponse(fileName: string, bytes: Uint8Array): Response {
  return new Response(new Uint8Array(bytes), {
    headers: { "content-type": "application/pdf", "content-disposition": `attachment; filename="${fileName.replace(/[^A-Za-z0-9._-]/g, "_")}"`, "cache-control": "no-store", "referrer-policy": "no-referrer" },
  });
}

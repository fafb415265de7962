import "server-only";
import { NextResponse } from "next/server";
import { z } from "zod";
import { requireActor, type Actor } from "@/lib/dal/actor";
import { AppError } from "@/lib/dal/errors";
import { fieldErrors } from "@/lib/validation/common";

export interface ErrorBody {
  error: { code: string; message: string; fields?: Record<string, string[]>; details?: Record<string, unknown> };
}

/** Maps any thrown error to the one JSON error shape `{error:{code,message,fields?}}`. */
export function errorResponse(err: unknown): NextResponse<ErrorBody> {
  if (err instanceof AppError) {
    return NextResponse.json(
      { error: { code: err.code, message: err.message, ...(err.fields && { fields: err.fields }), ...(err.details && { details: err.details }) } },
      { status: err.status },
    );
  }
  if (err instanceof z.ZodError) {
    return NextResponse.json(
      { error: { code: "validation_failed", message: "Some fields are not valid.", fields: fieldErrors(err) } },
      { status: 422 },
    );
  }
  console.error(err);
  return NextResponse.json({ error: { code: "internal", message: "Something went wrong on the server." } }, { status: 500 });
}

type Params = Record<string, string | string[]>;
interface Context<P> {
  req: Request;
  params: P;
  actor: Actor;
  url: URL;
}

/** Wraps a route handler: resolves params, requires a signed-in actor, maps errors. */
export function withActor<P extends Params = Record<string, string>>(fn: (ctx: Context<P>) => Promise<Response | unknown>) {
  return async (req: Request, ctx: { params: Promise<P> }): Promise<Response> => {
    try {
      const actor = await requireActor(req.headers);
      const params = (await ctx?.params) ?? ({} as P);
      const out = await fn({ req, params, actor, url: new URL(req.url) });
      return out instanceof Response ? out : NextResponse.json(out);
    } catch (err) {
      return errorResponse(err);
    }
  };
}

/** Reads a JSON body (malformed JSON is a 400). The DAL validates it after the access check. */
export async function parseJson(req: Request): Promise<unknown> {
  try {
    return await req.json();
  } catch {
    throw new AppError("bad_request", "The request body is not valid JSON.");
  }
}

/** Parses the query string with a schema (422 with field messages on failure). */
export function parseQuery<T extends z.ZodType>(url: URL, schema: T): z.infer<T> {
  const obj: Record<string, string> = {};
  url.searchParams.forEach((v, k) => {
    if (v !== "") obj[k] = v;
  });
  const parsed = schema.safeParse(obj);
  if (!parsed.success) throw new AppError("validation_failed", "Some query parameters are not valid.", fieldErrors(parsed.error));
  return parsed.data;
}

export const created = (body: unknown) => NextResponse.json(body, { status: 201 });

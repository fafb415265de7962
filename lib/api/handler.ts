import "server-only";
import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize, requireActor, type Actor } from "@/lib/dal/actor";
import { AppError } from "@/lib/dal/errors";
import type { Permission } from "@/lib/dal/permissions";
import { checkOrigin, SAFE_METHODS } from "@/lib/security/origin";
import { fieldErrors } from "@/lib/validation/common";
import { BODY_LIMITS, bodyRuleOf, isJsonType, limitBody, mediaType, readError, readLimitedBytes, tooLarge, type BodyRule } from "./body";

export interface ErrorBody {
  error: { code: string; message: string; fields?: Record<string, string[]>; details?: Record<string, unknown> };
}

/** Maps any thrown error to the one JSON error shape `{error:{code,message,fields?}}`. */
export function errorResponse(err: unknown): NextResponse<ErrorBody> {
  if (err instanceof AppError) {
    return NextResponse.json(
      { error: { code: err.code, message: err.message, ...(err.fields && { fields: err.fields }), ...(err.details && { details: err.details }) } },
      { status: err.status, ...(typeof err.details?.retryAfterSeconds === "number" && { headers: { "retry-after": String(err.details.retryAfterSeconds) } }) },
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

/** What a route declares so that the wrapper can refuse a request before its body is read. */
export interface RouteOptions<P> {
  /** Checked in `params.projectId` right after the session, before the body (the DAL checks again, precisely). */
  permission?: Permission;
  /** A check for routes outside a project (e.g. the reference library). Throw an AppError to refuse. */
  access?: (actor: Actor, params: P) => Promise<void>;
  /** Body kind and size limit; state-changing requests default to JSON of at most 1 MiB. */
  body?: BodyRule;
}

/** Refuses a state-changing request from another site (403): same origin or TRUSTED_ORIGINS only. */
export function assertSameOrigin(req: Request): void {
  const v = checkOrigin(req.method, req.headers, new URL(req.url).origin);
  if (!v.ok) throw new AppError("forbidden", v.reason ?? "Cross-site request refused.");
}

/**
 * Wraps a route handler: resolves params, requires a signed-in actor, checks Origin on state-changing methods,
 * the declared role (before any body byte is read), then the body's media type and size; maps errors.
 */
export function withActor<P extends Params = Record<string, string>>(fn: (ctx: Context<P>) => Promise<Response | unknown>): (req: Request, ctx: { params: Promise<P> }) => Promise<Response>;
export function withActor<P extends Params = Record<string, string>>(
  options: RouteOptions<P>,
  fn: (ctx: Context<P>) => Promise<Response | unknown>,
): (req: Request, ctx: { params: Promise<P> }) => Promise<Response>;
export function withActor<P extends Params = Record<string, string>>(
  a: RouteOptions<P> | ((ctx: Context<P>) => Promise<Response | unknown>),
  b?: (ctx: Context<P>) => Promise<Response | unknown>,
) {
  const options: RouteOptions<P> = typeof a === "function" ? {} : a;
  const fn = (typeof a === "function" ? a : b)!;
  return async (req: Request, ctx: { params: Promise<P> }): Promise<Response> => {
    try {
      const actor = await requireActor(req.headers);
      const params = (await ctx?.params) ?? ({} as P);
      const unsafe = !SAFE_METHODS.has(req.method.toUpperCase());
      if (unsafe) assertSameOrigin(req);
      if (options.permission) {
        const projectId = params.projectId;
        if (typeof projectId !== "string") throw new Error(`route declares ${options.permission} but has no projectId param`);
        await authorize(actor, projectId, options.permission);
      }
      if (options.access) await options.access(actor, params);
      const limited = unsafe ? limitBody(req, options.body ?? { kind: "json", maxBytes: BODY_LIMITS.json, label: "a JSON request" }) : req;
      const out = await fn({ req: limited, params, actor, url: new URL(req.url) });
      return out instanceof Response ? out : NextResponse.json(out);
    } catch (err) {
      return errorResponse(err);
    }
  };
}

/**
 * Reads a JSON body (malformed JSON is a 400, another media type 415). The size limit is the one the route wrapper
 * put on the request (1 MiB unless the route declares more); `maxBytes` applies when the request was not wrapped.
 * The DAL validates the value after its access check.
 */
export async function parseJson(req: Request, maxBytes: number = BODY_LIMITS.json): Promise<unknown> {
  if (!isJsonType(mediaType(req))) throw new AppError("unsupported_media_type", "Send the body as JSON (content-type application/json).");
  const rule: BodyRule = bodyRuleOf(req) ?? { kind: "json", maxBytes, label: "a JSON request" };
  const declared = Number(req.headers.get("content-length") ?? NaN);
  if (Number.isFinite(declared) && declared > rule.maxBytes) throw tooLarge(rule);
  let bytes: Uint8Array;
  try {
    bytes = await readLimitedBytes(req, rule);
  } catch (err) {
    throw readError(req, err, new AppError("bad_request", "The request body could not be read."));
  }
  try {
    return JSON.parse(new TextDecoder("utf-8", { fatal: true }).decode(bytes));
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

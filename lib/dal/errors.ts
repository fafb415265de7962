/** Errors the data-access layer throws; lib/api maps them to HTTP statuses and one JSON shape. */
export type ErrorCode =
  | "bad_request"
  | "unauthorized"
  | "forbidden"
  | "not_found"
  | "conflict"
  | "gone"
  | "validation_failed"
  | "payload_too_large"
  | "unsupported_media_type"
  | "too_many_requests"
  | "internal";

export const STATUS_OF: Record<ErrorCode, number> = {
  bad_request: 400,
  unauthorized: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  gone: 410,
  payload_too_large: 413,
  unsupported_media_type: 415,
  validation_failed: 422,
  too_many_requests: 429,
  internal: 500,
};

export type FieldErrors = Record<string, string[]>;

export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fields?: FieldErrors,
    readonly details?: Record<string, unknown>,
  ) {
    super(message);
    this.name = "AppError";
  }
  get status(): number {
    return STATUS_OF[this.code];
  }
}

export const notFound = (what = "Not found.") => new AppError("not_found", what);
export const forbidden = (why = "Your role in this project does not allow this.") => new AppError("forbidden", why);
export const unauthorized = () => new AppError("unauthorized", "Sign in first.");
export const conflict = (why: string, details?: Record<string, unknown>) => new AppError("conflict", why, undefined, details);
/** 429 with the wait in details.retryAfterSeconds (the route sets Retry-After from it). */
export const tooMany = (why: string, retryAfterSeconds: number) => new AppError("too_many_requests", why, undefined, { retryAfterSeconds });
export const invalid = (message: string, fields?: FieldErrors) => new AppError("validation_failed", message, fields);

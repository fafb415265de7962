/**
 * Request body limits, applied after the caller's session and role were checked and before a byte of the body is
 * read: the Content-Length header first (413 at once), then a byte counter on the stream itself, which also catches
 * chunked bodies that declare no length. Pure web-platform code (Request, ReadableStream): no framework imports.
 */
import { AppError } from "@/lib/dal/errors";

const MiB = 1024 * 1024;
/** Multipart framing around a file (boundaries, part headers, small text fields). */
const MULTIPART_OVERHEAD = 256 * 1024;

/** Largest request body per route kind, bytes. */
export const BODY_LIMITS = {
  /** Any JSON body (forms, edits, custody steps). */
  json: 1 * MiB,
  /** The CSV sample import sends the file's text inside JSON ({csv}); its own cap is 12 million characters. */
  csvImport: 16 * MiB,
  /** One photo per request (the uploader sends one file at a time); a photo is at most 25 MiB. */
  photo: 25 * MiB + MULTIPART_OVERHEAD,
  /** A scan upload or a bulk scan request. */
  scan: 50 * MiB + MULTIPART_OVERHEAD,
  /** CIF files of one import request together. */
  cif: 2 * MiB + MULTIPART_OVERHEAD,
  /** An MBTiles package, streamed to a temporary file (never held in memory). */
  tiles: 500 * MiB,
} as const;

export type BodyKind = "json" | "multipart" | "raw";

export interface BodyRule {
  kind: BodyKind;
  maxBytes: number;
  /** What the limit is for, in the 413 message ("a photo upload"). */
  label?: string;
}

const mb = (n: number) => `${(n / MiB).toFixed(n < 10 * MiB ? 1 : 0)} MiB`;

export function tooLarge(rule: BodyRule): AppError {
  return new AppError("payload_too_large", `The request body is larger than ${mb(rule.maxBytes)}, the limit for ${rule.label ?? "this request"}.`, undefined, {
    limitBytes: rule.maxBytes,
  });
}

/** The media type without parameters, lower case ("" when absent). */
export function mediaType(req: Request): string {
  return (req.headers.get("content-type") ?? "").split(";")[0].trim().toLowerCase();
}

export const isJsonType = (t: string) => t === "application/json" || /^application\/[a-z0-9.+-]+\+json$/.test(t);

/**
 * Checks the media type and the declared length, then returns a Request whose body is counted as it is read:
 * past `maxBytes` the stream errors and reading it throws a 413 {@link AppError}. Nothing is read here.
 */
export function limitBody(req: Request, rule: BodyRule): Request {
  const type = mediaType(req);
  // JSON's media type is checked where the body is parsed (parseJson): routes that ignore their body accept any.
  if (rule.kind === "multipart" && type !== "multipart/form-data") {
    throw new AppError("unsupported_media_type", "Send the files as multipart/form-data (a file upload form).");
  }
  const declared = req.headers.get("content-length");
  if (declared !== null) {
    const n = Number(declared);
    if (!Number.isFinite(n) || n < 0) throw new AppError("bad_request", "The Content-Length header is not a number.");
    if (n > rule.maxBytes) throw tooLarge(rule);
  }
  if (!req.body) return req;
  // Counted by hand rather than with pipeThrough: a transform that errors cancels its source, and cancelling a
  // request body makes the server drop the connection before the 413 can be sent. Here reading simply stops; the
  // server discards what the client still sends after the answer.
  let seen = 0;
  const source = req.body.getReader();
  const counted = new ReadableStream<Uint8Array>({
    async pull(controller) {
      const { done, value } = await source.read();
      if (done) return controller.close();
      seen += value.byteLength;
      if (seen > rule.maxBytes) {
        source.releaseLock();
        controller.error(tooLarge(rule));
        return;
      }
      controller.enqueue(value);
    },
    cancel(reason) {
      return source.cancel(reason);
    },
  });
  const limited = new Request(req.url, {
    method: req.method,
    headers: req.headers,
    body: counted,
    signal: req.signal,
    // @ts-expect-error -- Node's fetch needs duplex for a streamed request body (not in the DOM typings).
    duplex: "half",
  });
  Object.defineProperty(limited, LIMIT, { value: rule });
  return limited;
}

const LIMIT = Symbol.for("lithodex.bodyLimit");

/** The rule {@link limitBody} attached to a request, if any. */
export function bodyRuleOf(req: Request): BodyRule | undefined {
  return (req as unknown as Record<symbol, BodyRule | undefined>)[LIMIT];
}

/** Maps an error thrown while reading a limited body: the counter's 413 wins over the reader's generic error. */
export function readError(req: Request, err: unknown, fallback: AppError): AppError {
  if (err instanceof AppError) return err;
  const cause = (err as { cause?: unknown })?.cause;
  if (cause instanceof AppError) return cause;
  const rule = bodyRuleOf(req);
  if (rule && /larger than|payload_too_large/i.test(String((err as Error)?.message))) return tooLarge(rule);
  return fallback;
}

/** Reads the whole body as bytes through the limit (for small bodies only: JSON, CIF text). */
export async function readLimitedBytes(req: Request, rule: BodyRule): Promise<Uint8Array> {
  if (!req.body) return new Uint8Array(0);
  const reader = req.body.getReader();
  const parts: Uint8Array[] = [];
  let n = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    n += value.byteLength;
    if (n > rule.maxBytes) {
      reader.releaseLock(); // not cancel: that would drop the connection before the 413 is sent
      throw tooLarge(rule);
    }
    parts.push(value);
  }
  const out = new Uint8Array(n);
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.byteLength;
  }
  return out;
}

/**
 * Body limits are checked after the session and the role and before the body is read (issue 12): a consultant's
 * 200 MB scan upload is refused without one byte pulled, a lab analyst's oversize upload is refused on its
 * Content-Length, and a chunked body with no length is stopped by the byte counter just past the limit.
 */
import { beforeAll, describe, expect, test } from "vitest";
import { POST as photoUpload } from "@/app/api/projects/[projectId]/samples/[sampleId]/photos/route";
import { POST as createSample } from "@/app/api/projects/[projectId]/samples/route";
import { POST as scanUpload } from "@/app/api/projects/[projectId]/scans/route";
import { POST as createStation } from "@/app/api/projects/[projectId]/stations/route";
import { POST as tileUpload } from "@/app/api/projects/[projectId]/tile-packages/route";
import { POST as cifImport } from "@/app/api/reference-phases/import/route";
import { BODY_LIMITS } from "@/lib/api/body";
import { call, makeWorld, type World } from "../helpers/app";

let w: World;
let sampleId: string;
beforeAll(async () => {
  w = await makeWorld();
  const s = await call(createSample, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { sampleType: "hand_sample" } });
  sampleId = s.json.id;
});

/** A body of `total` bytes produced on demand in 64 KiB chunks; `pulled()` tells how many bytes were read. */
function meteredBody(total: number) {
  let sent = 0;
  const chunk = new Uint8Array(64 * 1024).fill(0x41);
  const stream = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (sent >= total) return controller.close();
      const n = Math.min(chunk.byteLength, total - sent);
      sent += n;
      controller.enqueue(n === chunk.byteLength ? chunk.slice() : chunk.slice(0, n));
    },
  });
  return { stream, pulled: () => sent };
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Handler = (req: Request, ctx: { params: Promise<any> }) => Promise<Response>;
async function send(handler: Handler, params: Record<string, string>, cookie: string, body: ReadableStream<Uint8Array>, headers: Record<string, string>) {
  const req = new Request("http://localhost:3000/api/x", { method: "POST", headers: { cookie, ...headers }, body, duplex: "half" } as RequestInit);
  const res = await handler(req, { params: Promise.resolve(params) });
  return { status: res.status, json: (await res.json().catch(() => null)) as { error?: { code: string; message: string } } | null };
}

const MB = 1024 * 1024;
const multipart = { "content-type": "multipart/form-data; boundary=xyz" };

describe("the role is checked before the body is read", () => {
  test("a consultant's 200 MB scan upload gets 403 with nothing pulled from the body", async () => {
    const b = meteredBody(200 * MB);
    const r = await send(scanUpload, { projectId: w.projectId }, w.cookies.consultant, b.stream, { ...multipart, "content-length": String(200 * MB) });
    expect(r.status).toBe(403);
    expect(b.pulled()).toBeLessThanOrEqual(64 * 1024); // at most the stream's first prefetched chunk
  });

  test("a member of another project gets 404 on the same upload, also before reading", async () => {
    const b = meteredBody(200 * MB);
    const r = await send(scanUpload, { projectId: w.projectId }, w.cookies.outsider, b.stream, multipart);
    expect(r.status).toBe(404);
    expect(b.pulled()).toBeLessThanOrEqual(64 * 1024);
  });

  test("a field geologist's CIF import is refused (403) before its body is read", async () => {
    const b = meteredBody(50 * MB);
    const r = await send(cifImport, {}, w.cookies.field_geologist, b.stream, multipart);
    expect(r.status).toBe(403);
    expect(b.pulled()).toBeLessThanOrEqual(64 * 1024);
  });
});

describe("Content-Length over the route's limit is refused without reading", () => {
  test.each([
    ["scan upload (50 MiB)", scanUpload, () => ({ projectId: w.projectId }), () => w.cookies.lab_analyst, BODY_LIMITS.scan],
    ["photo upload (25 MiB)", photoUpload, () => ({ projectId: w.projectId, sampleId }), () => w.cookies.field_geologist, BODY_LIMITS.photo],
    ["CIF import (2 MiB)", cifImport, () => ({}), () => w.cookies.lab_analyst, BODY_LIMITS.cif],
  ] as const)("%s → 413", async (_label, handler, params, cookie, limit) => {
    const b = meteredBody(limit + 1);
    const r = await send(handler as Handler, params(), cookie(), b.stream, { ...multipart, "content-length": String(limit + 1) });
    expect(r.status).toBe(413);
    expect(r.json?.error?.code).toBe("payload_too_large");
    expect(b.pulled()).toBeLessThanOrEqual(64 * 1024);
  });
});

describe("a chunked body (no Content-Length) is stopped by the byte counter", () => {
  test("a 600 MB chunked photo upload is refused after about 25 MiB has been read", async () => {
    const b = meteredBody(600 * MB);
    const r = await send(photoUpload, { projectId: w.projectId, sampleId }, w.cookies.field_geologist, b.stream, multipart);
    expect(r.status).toBe(413);
    expect(b.pulled()).toBeLessThan(BODY_LIMITS.photo + 4 * MB);
  });

  test("a 60 MB chunked scan upload is refused after about 50 MiB", async () => {
    const b = meteredBody(60 * MB);
    const r = await send(scanUpload, { projectId: w.projectId }, w.cookies.lab_analyst, b.stream, multipart);
    expect(r.status).toBe(413);
    expect(b.pulled()).toBeLessThan(BODY_LIMITS.scan + 4 * MB);
  });

  test("a 2 MB chunked JSON body on a 1 MiB JSON route is 413", async () => {
    const b = meteredBody(2 * MB);
    const r = await send(createStation, { projectId: w.projectId }, w.cookies.lead, b.stream, { "content-type": "application/json" });
    expect(r.status).toBe(413);
    expect(b.pulled()).toBeLessThan(BODY_LIMITS.json + 1 * MB);
  });

  test("a chunked MBTiles body past 500 MiB is streamed to disk and refused (413), never buffered", async () => {
    const b = meteredBody(BODY_LIMITS.tiles + 2 * MB);
    const before = process.memoryUsage().rss;
    const r = await send(tileUpload, { projectId: w.projectId }, w.cookies.field_geologist, b.stream, { "content-type": "application/vnd.sqlite3" });
    expect(r.status).toBe(413);
    // Streamed through a temp file: resident memory does not grow by anything near the 500 MiB read.
    expect(process.memoryUsage().rss - before).toBeLessThan(200 * MB);
  }, 120_000);
});

describe("JSON routes take JSON only", () => {
  test("text/plain on a JSON route is 415 (after the role check)", async () => {
    const enc = new TextEncoder().encode(JSON.stringify({ code: "X-1", lat: 1, lon: 1 }));
    const body = new ReadableStream<Uint8Array>({ start: (c) => (c.enqueue(enc), c.close()) });
    const r = await send(createStation, { projectId: w.projectId }, w.cookies.lead, body, { "content-type": "text/plain" });
    expect(r.status).toBe(415);
    const body2 = new ReadableStream<Uint8Array>({ start: (c) => (c.enqueue(enc), c.close()) });
    const c = await send(createStation, { projectId: w.projectId }, w.cookies.consultant, body2, { "content-type": "text/plain" });
    expect(c.status).toBe(403);
  });

  test("a POST with Origin http://evil.example is 403 and a same-origin one passes the check", async () => {
    const evil = await call(createStation, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { lat: 37.1, lon: -6.1 }, headers: { origin: "http://evil.example" } });
    expect(evil.status).toBe(403);
    expect(evil.json.error.message).toMatch(/evil\.example/);
    const same = await call(createStation, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { lat: 37.1, lon: -6.1 }, headers: { origin: "http://localhost:3000" } });
    expect(same.status).toBe(201);
  });
});

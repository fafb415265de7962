/**
 * Offline work beyond stations and samples, through the browser outbox (lib/client/outbox.ts; fake-indexeddb stands
 * in for the browser's store) and the device's code blocks (lib/client/code-block.ts) against the real route handlers
 * on a temp SQLite file: a structural measurement created offline arrives once; a measurement edited offline against
 * a newer version is a conflict (version/409, DEVELOPERS.md), resolved by keep-mine or take-theirs, never an
 * overwrite; a sample saved offline takes the device's reserved code and keeps it on sync. Replay semantics: IETF
 * HTTPAPI draft "The Idempotency-Key HTTP Header Field" (Jena & Dalal).
 */
import "fake-indexeddb/auto";
import { count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { POST as reserveRoute } from "@/app/api/projects/[projectId]/sample-code-blocks/route";
import { POST as createSampleRoute } from "@/app/api/projects/[projectId]/samples/route";
import { PATCH as patchStructureRoute } from "@/app/api/projects/[projectId]/stations/[stationId]/structures/[structureId]/route";
import { POST as createStructureRoute } from "@/app/api/projects/[projectId]/stations/[stationId]/structures/route";
import { getDb } from "@/db";
import { samples, structures } from "@/db/schema";
import { reservedCodeForOfflineSample, setCodeBlockUser, topUpCodeBlock, watchCodeBlocks } from "@/lib/client/code-block";
import { discard, enqueue, keepMine, listOutbox, newClientId, setOutboxUser, syncProject } from "@/lib/client/outbox";
import type { DeviceBlock } from "@/lib/outbox/code-block-math";
import { call, makeWorld, type World } from "../helpers/app";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
  setOutboxUser(w.userIds.field_geologist);
  setCodeBlockUser(w.userIds.field_geologist);
});

type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

/** fetch routed in-process to the handlers, with the field geologist's session; "offline" throws as the browser does. */
function network(mode: () => "online" | "offline", log: string[] = []): typeof fetch {
  return (async (input: RequestInfo | URL, init?: RequestInit) => {
    if (mode() === "offline") throw new TypeError("Failed to fetch");
    const url = String(input);
    const p = url.split("/"); // ["", "api", "projects", P, kind, id?, "structures", sid?]
    let handler: Handler;
    let params: Record<string, string>;
    if (p[4] === "sample-code-blocks") [handler, params] = [reserveRoute as unknown as Handler, { projectId: p[3] }];
    else if (p[4] === "samples") [handler, params] = [createSampleRoute as unknown as Handler, { projectId: p[3] }];
    else if (p[7]) [handler, params] = [patchStructureRoute as unknown as Handler, { projectId: p[3], stationId: p[5], structureId: p[7] }];
    else [handler, params] = [createStructureRoute as unknown as Handler, { projectId: p[3], stationId: p[5] }];
    const headers = new Headers(init?.headers);
    headers.set("cookie", w.cookies.field_geologist);
    const res = await handler(new Request(`http://localhost:3000${url}`, { method: init?.method, headers, body: init?.body }), { params: Promise.resolve(params) });
    log.push(`${init?.method} ${p[4] === "stations" ? "structures" : p[4]} ${res.status}`);
    return res;
  }) as typeof fetch;
}

const structuresUrl = () => `/api/projects/${w.projectId}/stations/${w.stationId}/structures`;

describe("offline structural measurements", () => {
  test("a measurement created offline arrives exactly once with its client id", async () => {
    let mode: "online" | "offline" = "offline";
    const log: string[] = [];
    const fetchImpl = network(() => mode, log);
    const id = newClientId();
    await enqueue({ projectId: w.projectId, kind: "structure", action: "create", recordId: id, opId: id, url: structuresUrl(), label: "New measurement (bedding)", body: { id, convention: "rhr", feature: "bedding", strike: 120, dip: 35 } });
    await syncProject(w.projectId, { force: true, fetchImpl });
    expect((await listOutbox(w.projectId))[0].state).toBe("queued");
    mode = "online";
    await syncProject(w.projectId, { force: true, fetchImpl });
    await syncProject(w.projectId, { force: true, fetchImpl });
    expect(await listOutbox(w.projectId)).toEqual([]);
    const rows = await getDb().select().from(structures).where(eq(structures.id, id));
    expect(rows).toHaveLength(1);
    // Right-hand rule: dip direction = strike + 90° (Ragan, "Structural Geology", ch. 1 — from memory): 120 → 210.
    expect(rows[0]).toMatchObject({ dipDirection: 210, dip: 35, version: 1 });
    expect(log).toEqual(["POST structures 201"]);
  });

  test("an offline edit against a newer version is a conflict; keep mine or take theirs, nothing overwritten silently", async () => {
    const fetchImpl = network(() => "online");
    const made = await call(createStructureRoute, { method: "POST", params: { projectId: w.projectId, stationId: w.stationId }, cookie: w.cookies.field_geologist, body: { convention: "dip_dipdir", feature: "foliation", dipDirection: 40, dip: 60 } });
    expect(made.status).toBe(201);
    const sid = made.json.id as string;
    const url = `${structuresUrl()}/${sid}`;
    await enqueue({ projectId: w.projectId, kind: "structure", action: "update", recordId: sid, url, label: "Edit of foliation", body: { version: 1, convention: "dip_dipdir", feature: "foliation", dipDirection: 45, dip: 58 } });
    const theirs = await call(patchStructureRoute, { method: "PATCH", params: { projectId: w.projectId, stationId: w.stationId, structureId: sid }, cookie: w.cookies.lead, body: { version: 1, convention: "dip_dipdir", feature: "foliation", dipDirection: 42, dip: 61, quality: "good" } });
    expect(theirs.status).toBe(200);

    await syncProject(w.projectId, { force: true, fetchImpl });
    const [item] = await listOutbox(w.projectId);
    expect(item.state).toBe("conflict");
    expect(item.serverRecord).toMatchObject({ dipDirection: 42, dip: 61, version: 2 });
    expect((await getDb().select().from(structures).where(eq(structures.id, sid)))[0]).toMatchObject({ dipDirection: 42, dip: 61 });

    await keepMine(item);
    await syncProject(w.projectId, { force: true, fetchImpl });
    expect(await listOutbox(w.projectId)).toEqual([]);
    expect((await getDb().select().from(structures).where(eq(structures.id, sid)))[0]).toMatchObject({ dipDirection: 45, dip: 58, version: 3 });

    // Take theirs: the device's edit is dropped and the server keeps its record.
    await enqueue({ projectId: w.projectId, kind: "structure", action: "update", recordId: sid, url, label: "Stale edit", body: { version: 1, convention: "dip_dipdir", feature: "foliation", dipDirection: 10, dip: 10 } });
    await syncProject(w.projectId, { force: true, fetchImpl });
    const [stale] = await listOutbox(w.projectId);
    expect(stale.state).toBe("conflict");
    await discard(stale.opId);
    expect((await getDb().select().from(structures).where(eq(structures.id, sid)))[0]).toMatchObject({ dipDirection: 45, version: 3 });
  });

  test("an unknown measurement is 404, a consultant 403, an edit without its version 422 naming the field", async () => {
    const bad = await call(patchStructureRoute, { method: "PATCH", params: { projectId: w.projectId, stationId: w.stationId, structureId: "nope" }, cookie: w.cookies.field_geologist, body: { version: 1, convention: "rhr", feature: "bedding", strike: 10, dip: 10 } });
    expect(bad.status).toBe(404);
    const consultant = await call(patchStructureRoute, { method: "PATCH", params: { projectId: w.projectId, stationId: w.stationId, structureId: "nope" }, cookie: w.cookies.consultant, body: { version: 1 } });
    expect(consultant.status).toBe(403);
    const noVersion = await call(patchStructureRoute, { method: "PATCH", params: { projectId: w.projectId, stationId: w.stationId, structureId: "nope" }, cookie: w.cookies.field_geologist, body: { convention: "rhr", feature: "bedding", strike: 10, dip: 10 } });
    expect(noVersion.status).toBe(422);
    expect(noVersion.json.error.fields.version).toBeTruthy();
  });
});

describe("device code block on the client", () => {
  test("reserved while online, taken by a sample saved offline, kept on sync; the block shows used and left", async () => {
    let mode: "online" | "offline" = "online";
    const log: string[] = [];
    const fetchImpl = network(() => mode, log);
    await topUpCodeBlock(w.projectId, w.userIds.field_geologist, { fetchImpl });
    expect(log).toEqual(["POST sample-code-blocks 201"]);
    let seen: DeviceBlock[] = [];
    const stop = watchCodeBlocks(w.projectId, w.userIds.field_geologist, (b) => (seen = b));
    await expect.poll(() => seen.length).toBe(1);
    expect(seen[0].codes).toHaveLength(20);

    mode = "offline";
    const reserved = await reservedCodeForOfflineSample(w.projectId);
    expect(reserved?.code).toBe(seen[0].codes[0]);
    const id = newClientId();
    await enqueue({ projectId: w.projectId, kind: "sample", action: "create", recordId: id, opId: id, label: `New sample (code ${reserved!.code})`, body: { sampleType: "chip", code: reserved!.code }, headers: reserved!.headers });
    const second = await reservedCodeForOfflineSample(w.projectId);
    expect(second?.code).toBe(seen[0].codes[1]); // never the same code twice

    mode = "online";
    await syncProject(w.projectId, { force: true, fetchImpl });
    expect(await listOutbox(w.projectId)).toEqual([]);
    const rows = await getDb().select().from(samples).where(eq(samples.id, id));
    expect(rows[0].code).toBe(reserved!.code);
    // A top-up with plenty left does nothing; forced, it adds a second, later block.
    await topUpCodeBlock(w.projectId, w.userIds.field_geologist, { fetchImpl });
    expect(log.filter((l) => l.startsWith("POST sample-code-blocks"))).toHaveLength(1);
    await topUpCodeBlock(w.projectId, w.userIds.field_geologist, { fetchImpl, force: true });
    await expect.poll(() => seen.length).toBe(2);
    expect(seen[1].codes[0] > seen[0].codes[19]).toBe(true);
    stop();
    expect((await getDb().select({ n: count() }).from(samples).where(eq(samples.code, reserved!.code)))[0].n).toBe(1);
  });
});

/**
 * The browser outbox (lib/client/outbox.ts, IndexedDB through Dexie; fake-indexeddb stands in for the browser's
 * store) sending to the real route handlers on a temp SQLite file. The network is simulated: "offline" throws before
 * the request reaches the server; "answer lost" lets the server commit, then throws, as a connection dropping
 * after the request went out would. Replay semantics: IETF HTTPAPI draft "The Idempotency-Key HTTP Header Field"
 * (Jena & Dalal); conflicts use the project's version/409 mechanism (DEVELOPERS.md, optimistic concurrency).
 */
import "fake-indexeddb/auto";
import { count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { PATCH as patchSampleRoute } from "@/app/api/projects/[projectId]/samples/[sampleId]/route";
import { POST as createSampleRoute } from "@/app/api/projects/[projectId]/samples/route";
import { PATCH as patchStationRoute } from "@/app/api/projects/[projectId]/stations/[stationId]/route";
import { POST as createStationRoute } from "@/app/api/projects/[projectId]/stations/route";
import { getDb } from "@/db";
import { samples, stations } from "@/db/schema";
import { discard, enqueue, keepMine, listOutbox, newClientId, setOutboxUser, syncProject } from "@/lib/client/outbox";
import { call, makeWorld, type World } from "../helpers/app";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});

type Mode = "online" | "offline" | "answer-lost";

/** fetch as the browser would do it, routed to the handlers in-process, with the field geologist's session. */
function network(mode: () => Mode, log: string[] = []): typeof fetch {
  return (async (input: RequestInfo | URL, init?: RequestInit) => {
    const m = mode();
    if (m === "offline") throw new TypeError("Failed to fetch");
    const url = String(input);
    const parts = url.split("/"); // ["", "api", "projects", P, kind, id?]
    const [projectId, kind, id] = [parts[3], parts[4], parts[5]];
    const handler = (kind === "samples" ? (id ? patchSampleRoute : createSampleRoute) : id ? patchStationRoute : createStationRoute) as unknown as (
      req: Request,
      ctx: { params: Promise<Record<string, string>> },
    ) => Promise<Response>;
    const headers = new Headers(init?.headers);
    headers.set("cookie", w.cookies.field_geologist);
    const req = new Request(`http://localhost:3000${url}`, { method: init?.method, headers, body: init?.body });
    const res = await handler(req, { params: Promise.resolve<Record<string, string>>(id ? { projectId, sampleId: id, stationId: id } : { projectId }) });
    log.push(`${init?.method} ${kind} ${res.status}`);
    if (m === "answer-lost") throw new TypeError("network connection was lost");
    return res;
  }) as typeof fetch;
}

const countById = async (table: typeof samples | typeof stations, id: string) => (await getDb().select({ n: count() }).from(table).where(eq(table.id, id)))[0].n;

describe("offline outbox against the real API", () => {
  test("a station and a sample saved offline arrive exactly once, even when the first answer is lost", async () => {
    let mode: Mode = "offline";
    const log: string[] = [];
    const fetchImpl = network(() => mode, log);
    const stationId = newClientId();
    const sampleId = newClientId();
    await enqueue({ projectId: w.projectId, kind: "station", action: "create", recordId: stationId, opId: stationId, label: "New station", body: { name: "Offline tor", lat: 37.76, lon: -6.64, locationSource: "device_gnss", horizontalAccuracyM: 8 } });
    await enqueue({ projectId: w.projectId, kind: "sample", action: "create", recordId: sampleId, opId: sampleId, label: "New sample (tag FT-0042)", body: { sampleType: "hand_sample", code: "FT-0042", stationId } });

    await syncProject(w.projectId, { force: true, fetchImpl });
    let items = await listOutbox(w.projectId);
    expect(items.map((i) => i.state)).toEqual(["queued", "queued"]);
    expect(items[0].attempts).toBe(1);
    expect(items[0].lastError).toMatch(/No connection/);
    // Full-jitter backoff puts the next try in the future; a non-forced round skips it.
    expect(items[0].nextAttemptAt).toBeGreaterThanOrEqual(Date.now() - 5);

    mode = "answer-lost"; // the server commits the station, the phone never hears back
    await syncProject(w.projectId, { force: true, fetchImpl });
    expect(await countById(stations, stationId)).toBe(1);
    items = await listOutbox(w.projectId);
    expect(items).toHaveLength(2); // still queued: the device cannot know it arrived

    mode = "online";
    await syncProject(w.projectId, { force: true, fetchImpl });
    expect(await listOutbox(w.projectId)).toEqual([]);
    expect(await countById(stations, stationId)).toBe(1);
    expect(await countById(samples, sampleId)).toBe(1);
    const [s] = await getDb().select().from(samples).where(eq(samples.id, sampleId));
    expect(s.code).toBe("FT-0042"); // the pre-printed tag typed in the field is kept
    expect(s.stationId).toBe(stationId);
    expect(log).toEqual(["POST stations 201", "POST stations 201", "POST samples 201"]);
  });

  test("an edit made offline against a record changed on the server meanwhile is a conflict, not an overwrite", async () => {
    const fetchImpl = network(() => "online");
    const made = await call(createSampleRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.field_geologist, body: { sampleType: "hand_sample", lithology: "schist" } });
    expect(made.status).toBe(201);
    const id = made.json.id as string;
    await enqueue({ projectId: w.projectId, kind: "sample", action: "update", recordId: id, label: `Edit of ${made.json.code}`, body: { version: 1, lithology: "phyllite" } });
    const theirs = await call(patchSampleRoute, { method: "PATCH", params: { projectId: w.projectId, sampleId: id }, cookie: w.cookies.lead, body: { version: 1, lithology: "garnet schist" } });
    expect(theirs.status).toBe(200);

    await syncProject(w.projectId, { force: true, fetchImpl });
    const [item] = await listOutbox(w.projectId);
    expect(item.state).toBe("conflict");
    expect(item.serverRecord?.lithology).toBe("garnet schist");
    expect(item.serverRecord?.version).toBe(2);
    const [row] = await getDb().select().from(samples).where(eq(samples.id, id));
    expect(row.lithology).toBe("garnet schist");

    // A conflict is not retried on its own.
    await syncProject(w.projectId, { force: true, fetchImpl });
    expect((await listOutbox(w.projectId))[0].state).toBe("conflict");

    // The person keeps their value: sent against version 2, the server now has it at version 3.
    await keepMine(item);
    await syncProject(w.projectId, { force: true, fetchImpl });
    expect(await listOutbox(w.projectId)).toEqual([]);
    const [after] = await getDb().select().from(samples).where(eq(samples.id, id));
    expect(after.lithology).toBe("phyllite");
    expect(after.version).toBe(3);
  });

  test("a record the server refuses is 'failed' with the field and reason, and is not retried", async () => {
    const fetchImpl = network(() => "online");
    const id = newClientId();
    await enqueue({ projectId: w.projectId, kind: "station", action: "create", recordId: id, opId: id, label: "Bad station", body: { lat: 95, lon: -6.6 } });
    await syncProject(w.projectId, { force: true, fetchImpl });
    const [item] = await listOutbox(w.projectId);
    expect(item.state).toBe("failed");
    expect(item.lastError).toMatch(/lat: Latitude must be between −90 and 90/);
    expect(await countById(stations, id)).toBe(0);
    await discard(item.opId);
  });

  test("an offline edit of a record still waiting to be created is folded into its create (one request, one row)", async () => {
    const log: string[] = [];
    const fetchImpl = network(() => "online", log);
    const id = newClientId();
    await enqueue({ projectId: w.projectId, kind: "sample", action: "create", recordId: id, opId: id, label: "New sample", body: { sampleType: "soil", lithology: "loam" } });
    await enqueue({ projectId: w.projectId, kind: "sample", action: "update", recordId: id, label: "Edit", body: { version: 1, lithology: "sandy loam" } });
    expect(await listOutbox(w.projectId)).toHaveLength(1);
    await syncProject(w.projectId, { force: true, fetchImpl });
    expect(log).toEqual(["POST samples 201"]);
    const [row] = await getDb().select().from(samples).where(eq(samples.id, id));
    expect(row.lithology).toBe("sandy loam");
  });

  test("work saved on a shared device by one account is not sent with another account's session", async () => {
    const log: string[] = [];
    const fetchImpl = network(() => "online", log);
    const id = newClientId();
    setOutboxUser("account-a");
    await enqueue({ projectId: w.projectId, kind: "sample", action: "create", recordId: id, opId: id, label: "A's sample", body: { sampleType: "soil" } });
    setOutboxUser("account-b");
    await syncProject(w.projectId, { force: true, fetchImpl });
    expect(log).toEqual([]);
    expect((await listOutbox(w.projectId))[0].userId).toBe("account-a");
    setOutboxUser("account-a");
    await syncProject(w.projectId, { force: true, fetchImpl });
    expect(log).toEqual(["POST samples 201"]);
    expect(await countById(samples, id)).toBe(1);
    setOutboxUser(null);
  });
});

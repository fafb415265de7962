import { beforeAll, describe, expect, test } from "vitest";
import { POST as createRoute } from "@/app/api/projects/[projectId]/stations/[stationId]/structures/route";
import { GET as listRoute } from "@/app/api/projects/[projectId]/structures/route";
import { call, makeWorld, type World } from "../helpers/app";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});

describe("GET /api/projects/:projectId/structures (the map's strike/dip symbols)", () => {
  test("lists every measurement with its station's code and position; a consultant may read; an outsider gets 404", async () => {
    const made = await call(createRoute, { method: "POST", params: { projectId: w.projectId, stationId: w.stationId }, cookie: w.cookies.field_geologist, body: { convention: "rhr", feature: "bedding", strike: 90, dip: 30 } });
    expect(made.status, JSON.stringify(made.json)).toBe(201);
    const r = await call(listRoute, { method: "GET", params: { projectId: w.projectId }, cookie: w.cookies.consultant });
    expect(r.status).toBe(200);
    const row = r.json.items.find((s: { id: string }) => s.id === made.json.id);
    // Strike 090 by the right-hand rule dips south: dip direction 180 (right-hand rule, common practice).
    expect(row).toMatchObject({ stationId: w.stationId, kind: "planar", feature: "bedding", dipDirection: 180, dip: 30, overturned: false });
    expect(typeof row.stationCode).toBe("string");
    expect(Number.isFinite(row.lat) && Number.isFinite(row.lon)).toBe(true);
    const outsider = await call(listRoute, { method: "GET", params: { projectId: w.projectId }, cookie: w.cookies.outsider });
    expect(outsider.status).toBe(404);
  });
});

import { readFileSync } from "node:fs";
import sharp from "sharp";
import { beforeAll, describe, expect, test } from "vitest";
import { DELETE as deleteRoute } from "@/app/api/projects/[projectId]/tile-packages/[pkgId]/route";
import { GET as tileRoute } from "@/app/api/projects/[projectId]/tile-packages/[pkgId]/tiles/[z]/[x]/[y]/route";
import { GET as listRoute, POST as uploadRoute } from "@/app/api/projects/[projectId]/tile-packages/route";
import { getStorage } from "@/lib/storage";
import { call, makeWorld, type World } from "../helpers/app";
import { solidPng, writeMbtiles } from "../helpers/mbtiles-fixture";

let w: World;
let file: Uint8Array;
beforeAll(async () => {
  w = await makeWorld();
  // Tile 15/16592/11272 covers 48.85837 N 2.29448 E (slippy-map tile formula; stored at TMS row 21495, MBTiles 1.3).
  const path = await writeMbtiles(
    { name: "Survey orthophoto", format: "png", minzoom: "14", maxzoom: "15", bounds: "2.28,48.85,2.31,48.87", attribution: "<b>Own</b> drone survey" },
    [
      { z: 15, x: 16592, y: 11272, data: await solidPng([180, 40, 40]) },
      { z: 14, x: 8296, y: 5636, data: await solidPng([40, 40, 180]) },
    ],
  );
  file = new Uint8Array(readFileSync(path));
});

const upload = (cookie: string, body: BodyInit = file as BodyInit, headers: Record<string, string> = { "content-type": "application/vnd.sqlite3", "x-filename": "ortho.mbtiles" }) =>
  call(uploadRoute, { method: "POST", params: { projectId: w.projectId }, cookie, rawBody: body, headers });

/** Calls the tile route and returns the raw bytes (the helper decodes bodies as text). */
async function tile(cookie: string | undefined, pkgId: string, z: string, x: string, y: string) {
  const headers = new Headers(cookie ? { cookie } : {});
  const res = await tileRoute(new Request("http://localhost:3000/tile", { headers }), { params: Promise.resolve({ projectId: w.projectId, pkgId, z, x, y }) });
  return { status: res.status, type: res.headers.get("content-type"), bytes: new Uint8Array(await res.arrayBuffer()) };
}

describe("tile packages (MBTiles map layers)", () => {
  let pkgId: string;

  test("a field geologist uploads an MBTiles file made in the test; metadata is kept, HTML is not interpreted here", async () => {
    const r = await upload(w.cookies.field_geologist);
    expect(r.status, JSON.stringify(r.json)).toBe(201);
    expect(r.json).toMatchObject({ name: "Survey orthophoto", format: "png", minZoom: 14, maxZoom: 15, bounds: "2.28,48.85,2.31,48.87", attribution: "<b>Own</b> drone survey" });
    expect(r.json.storageKey).toBeUndefined();
    pkgId = r.json.id;
    const list = await call(listRoute, { params: { projectId: w.projectId }, cookie: w.cookies.consultant });
    expect(list.json.items.map((p: { id: string }) => p.id)).toEqual([pkgId]);
  });

  test("GET a tile: XYZ address, PNG bytes, image/png; the decoded colour is the one stored", async () => {
    const t = await tile(w.cookies.consultant, pkgId, "15", "16592", "11272");
    expect(t.status).toBe(200);
    expect(t.type).toBe("image/png");
    const { channels } = await sharp(Buffer.from(t.bytes)).stats();
    expect(Math.round(channels[0].mean)).toBe(180); // red channel written by the fixture
    const z14 = await tile(w.cookies.lab_analyst, pkgId, "14", "8296", "5636.png");
    expect(z14.status).toBe(200);
  });

  test("missing tiles are 204; malformed addresses and unknown packages are 404", async () => {
    expect((await tile(w.cookies.lead, pkgId, "15", "16592", "21495")).status).toBe(204); // the TMS row is not an XYZ row
    expect((await tile(w.cookies.lead, pkgId, "10", "0", "0")).status).toBe(204); // below minzoom
    expect((await tile(w.cookies.lead, pkgId, "3", "9", "0")).status).toBe(404); // x ≥ 2^3
    expect((await tile(w.cookies.lead, pkgId, "15", "a", "0")).status).toBe(404);
    expect((await tile(w.cookies.lead, "no-such-package", "15", "16592", "11272")).status).toBe(404);
  });

  test("non-members get 404 for tiles and lists; no session 401", async () => {
    expect((await tile(w.cookies.outsider, pkgId, "15", "16592", "11272")).status).toBe(404);
    expect((await call(listRoute, { params: { projectId: w.projectId }, cookie: w.cookies.outsider })).status).toBe(404);
    expect((await tile(undefined, pkgId, "15", "16592", "11272")).status).toBe(401);
  });

  test("roles: consultant and lab analyst may not upload or delete (403)", async () => {
    expect((await upload(w.cookies.consultant)).status).toBe(403);
    expect((await upload(w.cookies.lab_analyst)).status).toBe(403);
    expect((await call(deleteRoute, { method: "DELETE", params: { projectId: w.projectId, pkgId }, cookie: w.cookies.consultant })).status).toBe(403);
  });

  test("bad uploads are refused with the reason: not SQLite, missing metadata, multipart", async () => {
    const junk = await upload(w.cookies.lead, new TextEncoder().encode("this is not a database"));
    expect(junk.status).toBe(422);
    expect(junk.json.error.fields.file[0]).toMatch(/not an SQLite database/);
    const noFormat = new Uint8Array(readFileSync(await writeMbtiles({ name: "no format" }, [{ z: 0, x: 0, y: 0, data: await solidPng([0, 0, 0]) }])));
    const r = await upload(w.cookies.lead, noFormat as BodyInit);
    expect(r.status).toBe(422);
    expect(r.json.error.fields.file[0]).toMatch(/"format" is required/);
    expect((await upload(w.cookies.lead, file as BodyInit, { "content-type": "multipart/form-data; boundary=x" })).status).toBe(415);
  });

  test("the lead deletes the package: tiles are gone and the stored file is removed", async () => {
    const list = await call(listRoute, { params: { projectId: w.projectId }, cookie: w.cookies.lead });
    expect(list.json.items).toHaveLength(1);
    const del = await call(deleteRoute, { method: "DELETE", params: { projectId: w.projectId, pkgId }, cookie: w.cookies.lead });
    expect(del.status).toBe(204);
    expect((await tile(w.cookies.lead, pkgId, "15", "16592", "11272")).status).toBe(404);
    expect(await getStorage().head(`projects/${w.projectId}/tile-packages/${pkgId}.mbtiles`)).toBeNull();
  });
});

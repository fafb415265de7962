import { beforeAll, describe, expect, test } from "vitest";
import { getDb } from "@/db";
import { stations } from "@/db/schema";
import { GET as phaseMapRoute } from "@/app/api/projects/[projectId]/phase-map/route";
import { GET as mineralsRoute } from "@/app/api/projects/[projectId]/phase-map/minerals/route";
import { GET as stationRoute } from "@/app/api/projects/[projectId]/phase-map/stations/[stationKey]/route";
import { POST as createRoute } from "@/app/api/projects/[projectId]/samples/route";
import type { PhaseMapData } from "@/lib/phase-map";
import { call, makeWorld, type World } from "../helpers/app";
import { addScan } from "../helpers/phase-fixtures";

/*
 * Invented scenario on real Iberian Pyrite Belt coordinates. What counts as confirmed follows common practice
 * and the lab workflow: a phase is confirmed only when accepted on a signed-off scan; a candidate is not an
 * identification.
 *   A: S1 signed off — quartz 60 wt%, pyrite 20 wt% accepted (kaolinite left undecided: not shown);
 *      S6 under review — pyrite rejected (never counts).
 *   B: S2 under review — pyrite leading candidate (rank 1), quartz accepted but not signed off.
 *   C: S3 signed off — goethite 30 wt%; a second scan under review has pyrite at rank 2.
 *   S4 (no station, own position): signed off — calcite. S5 (no position at all): signed off — pyrite.
 */
let w: World;
const ids: Record<string, string> = {};
const st: Record<string, string> = {};

beforeAll(async () => {
  w = await makeWorld();
  const db = getDb();
  st.A = w.stationId;
  const [b] = await db.insert(stations).values({ projectId: w.projectId, code: "PM-ST-B", lat: 37.65, lon: -6.55, lithology: "shale" }).returning();
  const [c] = await db.insert(stations).values({ projectId: w.projectId, code: "PM-ST-C", lat: 37.72, lon: -6.48, lithology: "gossan" }).returning();
  st.B = b.id;
  st.C = c.id;
  const mk = async (key: string, body: Record<string, unknown>) => {
    const r = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body });
    expect(r.status).toBe(201);
    ids[key] = r.json.id;
  };
  await mk("S1", { code: "PM-001", sampleType: "hand_sample", stationId: st.A, lithology: "rhyolite", collectedAt: "2026-03-10T09:00:00Z", collectorName: "Ana Ruiz" });
  await mk("S2", { code: "PM-002", sampleType: "chip", stationId: st.B, lithology: "shale", collectedAt: "2026-03-12T09:00:00Z", collectorName: "Ben Ortega" });
  await mk("S3", { code: "PM-003", sampleType: "hand_sample", stationId: st.C, lithology: "gossan", collectedAt: "2026-03-14T09:00:00Z", collectorName: "Ana Ruiz" });
  await mk("S4", { code: "PM-004", sampleType: "float", lat: 37.61, lon: -6.7, lithology: "limestone", collectedAt: "2026-03-15T09:00:00Z" });
  await mk("S5", { code: "PM-005", sampleType: "soil", collectedAt: "2026-03-16T09:00:00Z" });
  await mk("S6", { code: "PM-006", sampleType: "soil", stationId: st.A, collectedAt: "2026-03-16T10:00:00Z" });
  await addScan(w.projectId, ids.S1, { signedOff: true, phases: [{ mineral: "quartz", status: "accepted", rank: 1, wt: 60 }, { mineral: "pyrite", status: "accepted", rank: 2, wt: 20 }, { mineral: "kaolinite", status: "candidate", rank: 3 }] });
  await addScan(w.projectId, ids.S2, { signedOff: false, phases: [{ mineral: "pyrite", status: "candidate", rank: 1 }, { mineral: "quartz", status: "accepted", rank: 2, wt: 40 }] });
  await addScan(w.projectId, ids.S3, { signedOff: true, phases: [{ mineral: "goethite", status: "accepted", rank: 1, wt: 30 }] });
  await addScan(w.projectId, ids.S3, { signedOff: false, phases: [{ mineral: "hematite", status: "candidate", rank: 1 }, { mineral: "pyrite", status: "candidate", rank: 2 }] });
  await addScan(w.projectId, ids.S4, { signedOff: true, phases: [{ mineral: "calcite", status: "accepted", rank: 1, wt: 90 }] });
  await addScan(w.projectId, ids.S5, { signedOff: true, phases: [{ mineral: "pyrite", status: "accepted", rank: 1, wt: 5 }] });
  await addScan(w.projectId, ids.S6, { signedOff: false, phases: [{ mineral: "pyrite", status: "rejected", rank: 1 }] });
});

const get = async (query: string, cookie = w.cookies.consultant) => call(phaseMapRoute, { path: `/?${query}`, params: { projectId: w.projectId }, cookie });
const map = async (query: string) => {
  const r = await get(query);
  expect(r.status).toBe(200);
  return r.json as PhaseMapData;
};
const keys = (d: PhaseMapData) => d.stations.map((s) => s.key).sort();

describe("phase map", () => {
  test("filtering by one mineral returns only the stations where it was confirmed", async () => {
    const d = await map("mineral=pyrite");
    expect(keys(d)).toEqual([st.A]);
    const a = d.stations[0];
    expect(a.phases.map((p) => [p.mineral, p.kind, p.samples])).toEqual([
      ["quartz", "confirmed", 1],
      ["pyrite", "confirmed", 1],
    ]);
    // S5 has pyrite confirmed but no position: counted, not drawn.
    expect(d.totals).toEqual({ samples: 2, stations: 1, unlocatedSamples: 1 });
  });

  test("candidate toggle: phase=any adds stations where the mineral is a leading candidate; leading limits the rank", async () => {
    const any = await map("mineral=pyrite&phase=any");
    expect(keys(any)).toEqual([st.A, st.B, st.C].sort());
    const kindAt = (d: PhaseMapData, key: string) => d.stations.find((s) => s.key === key)!.phases.find((p) => p.mineral === "pyrite")!.kind;
    expect(kindAt(any, st.A)).toBe("confirmed");
    expect(kindAt(any, st.B)).toBe("candidate");
    expect(kindAt(any, st.C)).toBe("candidate");
    // Pyrite is rank 2 at C: with only the first candidate counting, C drops out.
    expect(keys(await map("mineral=pyrite&phase=any&leading=1"))).toEqual([st.A, st.B].sort());
    // Candidate-only: where pyrite awaits review and is not confirmed.
    expect(keys(await map("mineral=pyrite&phase=candidate"))).toEqual([st.B, st.C].sort());
  });

  test("wt% is the mean over the station's samples; undecided candidates of a signed-off scan and rejected results never show", async () => {
    const d = await map("");
    const a = d.stations.find((s) => s.key === st.A)!;
    expect(a.samples).toBe(2);
    expect(a.phases.find((p) => p.mineral === "quartz")).toMatchObject({ kind: "confirmed", wtMean: 60, wtMax: 60 });
    expect(a.phases.some((p) => p.mineral === "kaolinite")).toBe(false);
    expect(a.phases.filter((p) => p.mineral === "pyrite").map((p) => p.samples)).toEqual([1]);
    // Default view shows confirmed phases only; B has none yet.
    expect(d.stations.find((s) => s.key === st.B)!.phases).toEqual([]);
    // The unattached sample with its own position is its own point.
    const s4 = d.stations.find((s) => s.key === `sample:${ids.S4}`)!;
    expect([s4.lat, s4.lon, s4.code]).toEqual([37.61, -6.7, "PM-004"]);
    // The mineral list ignores the mineral filter: pyrite is confirmed at A and in S5, a candidate only at B and C.
    const minerals = await call(mineralsRoute, { path: "/?mineral=quartz", params: { projectId: w.projectId }, cookie: w.cookies.consultant });
    expect(minerals.json.items.find((m: { mineral: string }) => m.mineral === "pyrite")).toMatchObject({ symbol: "Py", confirmedStations: 2, candidateStations: 2 });
    expect(minerals.json.items.map((m: { mineral: string }) => m.mineral)).toEqual(["calcite", "goethite", "hematite", "pyrite", "quartz"]);
  });

  test("group filter and the register filters (lithology, date range, collector)", async () => {
    expect(keys(await map("group=sulfide"))).toEqual([st.A]);
    expect(keys(await map("group=hydroxide"))).toEqual([st.C]);
    expect(keys(await map("lithology=gossan"))).toEqual([st.C]);
    expect(keys(await map("from=2026-03-11&to=2026-03-14"))).toEqual([st.B, st.C].sort());
    expect(keys(await map("collector=Ana"))).toEqual([st.A, st.C].sort());
    expect(keys(await map("mineral=quartz&collector=Ben"))).toEqual([]);
    expect(keys(await map("mineral=quartz&phase=any&collector=Ben"))).toEqual([st.B]);
  });

  test("station panel lists the matching samples with confirmed phases, candidates and scans", async () => {
    const r = await call(stationRoute, { path: "/?phase=any", params: { projectId: w.projectId, stationKey: st.C }, cookie: w.cookies.consultant });
    expect(r.status).toBe(200);
    const [s3] = r.json.samples;
    expect(s3.code).toBe("PM-003");
    expect(s3.phases.confirmed.map((p: { symbol: string; wtPercent: number }) => [p.symbol, p.wtPercent])).toEqual([["Gth", 30]]);
    expect(s3.phases.candidates.map((p: { symbol: string }) => p.symbol).sort()).toEqual(["Hem", "Py"]);
    expect(s3.scans).toHaveLength(2);
    const own = await call(stationRoute, { path: "/", params: { projectId: w.projectId, stationKey: `sample:${ids.S4}` }, cookie: w.cookies.consultant });
    expect(own.json.samples[0].phases.confirmed[0].symbol).toBe("Cal");
    expect((await call(stationRoute, { path: "/", params: { projectId: w.projectId, stationKey: "nope" }, cookie: w.cookies.consultant })).status).toBe(404);
  });

  test("roles: every member reads it; outsider 404; no session 401; bad filters 422 with the field named", async () => {
    for (const who of ["lead", "field_geologist", "lab_analyst", "consultant", "admin"] as const) expect((await get("", w.cookies[who])).status).toBe(200);
    expect((await get("", w.cookies.outsider)).status).toBe(404);
    expect((await call(phaseMapRoute, { path: "/", params: { projectId: w.projectId } })).status).toBe(401);
    const bad = await get("phase=maybe&leading=0");
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.json.error.fields).sort()).toEqual(["leading", "phase"]);
    expect((await get("mineral=%3Cscript%3E")).status).toBe(422);
  });
});

import Supercluster from "supercluster";
import { describe, expect, test } from "vitest";
import { PHASE_CLUSTER_OPTIONS, clusterSegments, stationPointProps, stationSegments, type ClusterSummary, type PhaseMapStation, type StationPointProps } from "@/lib/phase-map";

/** Deterministic invented stations on a grid in the demo district (real coordinates). */
function stations(n: number): PhaseMapStation[] {
  const minerals: [string, string][] = [["quartz", "silica"], ["pyrite", "sulfide"], ["goethite", "hydroxide"], ["kaolinite", "clay"], ["chalcopyrite", "sulfide"]];
  return Array.from({ length: n }, (_, i) => ({
    key: `st-${i}`,
    stationId: `st-${i}`,
    code: `ST-${i}`,
    name: null,
    lat: 37.6 + (i % 20) * 0.008,
    lon: -6.75 + Math.floor(i / 20) * 0.01,
    samples: 1 + (i % 3),
    lithology: null,
    lastCollectedAt: null,
    phases: minerals
      .filter((_, k) => (i + k) % 3 !== 0)
      .map(([mineral, group], k) => ({ mineral, group, symbol: "", kind: (i + k) % 4 === 0 ? "candidate" : "confirmed", samples: 1, wtMean: 10 + k, wtMax: 10 + k }) as const),
  }));
}

function build(list: PhaseMapStation[], candidates = true) {
  const index = new Supercluster<StationPointProps, ClusterSummary>({ radius: 60, maxZoom: 16, ...PHASE_CLUSTER_OPTIONS });
  index.load(list.map((s) => ({ type: "Feature", geometry: { type: "Point", coordinates: [s.lon, s.lat] }, properties: stationPointProps(s, candidates) })));
  return index;
}

describe("cluster summaries (supercluster map/reduce)", () => {
  test("each cluster's summary equals the sum over its leaves, at every zoom", () => {
    // Independent check: supercluster's own getLeaves() gives the points inside a cluster.
    const list = stations(300);
    const index = build(list);
    const byKey = new Map(list.map((s) => [s.key, s]));
    let checked = 0;
    for (let z = 4; z <= 14; z += 2) {
      for (const f of index.getClusters([-180, -85, 180, 85], z)) {
        const p = f.properties as Partial<ClusterSummary & { cluster: boolean; cluster_id: number; point_count: number }>;
        if (!p.cluster) continue;
        const leaves = index.getLeaves(p.cluster_id!, Infinity).map((l) => byKey.get(l.properties.key)!);
        expect(p.stations).toBe(p.point_count);
        expect(p.samples).toBe(leaves.reduce((a, s) => a + s.samples, 0));
        for (const mineral of ["quartz", "pyrite", "goethite", "kaolinite", "chalcopyrite"]) {
          const c = leaves.filter((s) => s.phases.some((x) => x.mineral === mineral && x.kind === "confirmed")).length;
          const k = leaves.filter((s) => !s.phases.some((x) => x.mineral === mineral && x.kind === "confirmed") && s.phases.some((x) => x.mineral === mineral && x.kind === "candidate")).length;
          expect(p.phases![mineral]?.c ?? 0).toBe(c);
          expect(p.phases![mineral]?.k ?? 0).toBe(k);
        }
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(10);
  });

  test("clustering does not change the input points' properties", () => {
    const list = stations(50);
    const props = list.map((s) => stationPointProps(s));
    const before = JSON.stringify(props);
    const index = new Supercluster<StationPointProps, ClusterSummary>({ radius: 80, ...PHASE_CLUSTER_OPTIONS });
    index.load(props.map((p, i) => ({ type: "Feature", geometry: { type: "Point", coordinates: [list[i].lon, list[i].lat] }, properties: p })));
    index.getClusters([-180, -85, 180, 85], 3);
    expect(JSON.stringify(props)).toBe(before);
  });

  test("without candidates, only confirmed phases are counted", () => {
    const index = build(stations(100), false);
    const [top] = index.getClusters([-180, -85, 180, 85], 0);
    const p = top.properties as ClusterSummary;
    for (const v of Object.values(p.phases)) expect(v.k).toBe(0);
  });

  test("cluster ring: confirmed and candidate-only parts per mineral, largest first, rest in one grey segment", () => {
    const seg = clusterSegments({ phases: { quartz: { c: 5, k: 1, g: "silica" }, pyrite: { c: 0, k: 2, g: "sulfide" }, gold: { c: 1, k: 0, g: "native element" } } }, { max: 2 });
    expect(seg.map((s) => [s.symbol, s.confirmed, s.weight])).toEqual([
      ["Qz", true, 5],
      ["Qz", false, 1],
      ["Py", false, 2],
      ["…", true, 1],
    ]);
  });

  test("station segments: confirmed before candidates, then by wt%", () => {
    const s = stationSegments({
      phases: [
        { mineral: "kaolinite", group: "clay", symbol: "Kln", kind: "candidate", samples: 3, wtMean: null, wtMax: null },
        { mineral: "pyrite", group: "sulfide", symbol: "Py", kind: "confirmed", samples: 1, wtMean: 5, wtMax: 5 },
        { mineral: "quartz", group: "silica", symbol: "Qz", kind: "confirmed", samples: 2, wtMean: 70, wtMax: 80 },
      ],
    });
    expect(s.map((x) => x.symbol)).toEqual(["Qz", "Py", "Kln"]);
    expect(stationSegments({ phases: [{ mineral: "kaolinite", group: "clay", symbol: "Kln", kind: "candidate", samples: 3, wtMean: null, wtMax: null }] }, { candidates: false })).toEqual([]);
  });
});

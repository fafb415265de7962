"use client";

import { useQuery } from "@tanstack/react-query";
import { sampleKeys, stationKeys, tilePackageKeys } from "@/lib/client/query-keys";
import { fetchJson } from "@/lib/client/fetch-json";
import type { MapSample, MapStation, TilePackageInfo } from "./types";

interface SampleFeature {
  geometry: { type: "Point"; coordinates: [number, number] } | null;
  properties: { sample_id: string; code: string; sample_type: string; status: string; station_code: string | null; position_source: "sample" | "station" | null };
}

/** Stations of the project (`{items, total}`, up to 2,000). */
export function useStations(projectId: string) {
  return useQuery({
    queryKey: stationKeys.map(projectId),
    queryFn: async () => {
      const body = await fetchJson<unknown>(`/api/projects/${projectId}/stations?limit=2000`);
      const list = (Array.isArray(body) ? body : ((body as { items?: unknown[] })?.items ?? [])) as MapStation[];
      return list.filter((s) => Number.isFinite(s.lat) && Number.isFinite(s.lon));
    },
  });
}

/** Located samples matching the register filter `filterQuery`, read from the GeoJSON export. */
export function useMapSamples(projectId: string, filterQuery: string) {
  return useQuery({
    queryKey: sampleKeys.map(projectId, filterQuery),
    queryFn: async () => {
      const fc = await fetchJson<{ features: SampleFeature[] }>(`/api/projects/${projectId}/samples/export?format=geojson${filterQuery ? `&${filterQuery}` : ""}`);
      const out: MapSample[] = [];
      for (const f of fc.features) {
        if (!f.geometry) continue;
        const p = f.properties;
        out.push({
          id: p.sample_id,
          code: p.code,
          sampleType: p.sample_type,
          status: p.status,
          stationCode: p.station_code,
          lon: f.geometry.coordinates[0],
          lat: f.geometry.coordinates[1],
          positionSource: p.position_source === "station" ? "station" : "sample",
        });
      }
      return { samples: out, unlocated: fc.features.length - out.length };
    },
  });
}

export function useTilePackages(projectId: string) {
  return useQuery({
    queryKey: tilePackageKeys.all(projectId),
    queryFn: async () => (await fetchJson<{ items: TilePackageInfo[] }>(`/api/projects/${projectId}/tile-packages`)).items,
  });
}

"use client";

import L from "leaflet";
import { useCallback, useEffect, useMemo, useRef, useSyncExternalStore } from "react";
import { Marker, useMap } from "react-leaflet";
import Supercluster from "supercluster";
import {
  PHASE_CLUSTER_OPTIONS,
  clusterSegments,
  clusterSymbolSvg,
  describePhases,
  stationPointProps,
  stationSegments,
  stationSymbolSvg,
  type ClusterSummary,
  type PhaseMapStation,
  type StationPointProps,
} from "@/lib/phase-map";

const icons = new Map<string, L.DivIcon>();
function iconFor(svg: string, size: number, attrs: string): L.DivIcon {
  const html = `<div ${attrs}>${svg}</div>`;
  let icon = icons.get(html);
  if (!icon) {
    icon = L.divIcon({ html, className: "lx-phase", iconSize: [size, size], iconAnchor: [size / 2, size / 2] });
    if (icons.size > 3000) icons.clear();
    icons.set(html, icon);
  }
  return icon;
}

const attr = (s: string) => s.replace(/[&"<>]/g, (c) => ({ "&": "&amp;", '"': "&quot;", "<": "&lt;", ">": "&gt;" })[c]!);

export interface ViewState {
  bounds: L.LatLngBounds;
  zoom: number;
}

/**
 * Stations as phase symbols, clustered with supercluster (cluster rings summarise the phases of their
 * stations). Reports the visible area so the side list can follow the map.
 */
export function PhaseLayer({
  stations,
  candidates,
  mineral,
  selectedKey,
  onSelect,
  onView,
}: {
  stations: readonly PhaseMapStation[];
  candidates: boolean;
  mineral: string | null;
  selectedKey: string | null;
  onSelect: (key: string) => void;
  onView: (v: ViewState) => void;
}) {
  const map = useMap();
  // The map is an external store: re-render on every completed move or zoom (also one that happened
  // before this layer subscribed, e.g. the first fit to the stations).
  const snapshot = useSyncExternalStore(
    useCallback(
      (onChange: () => void) => {
        map.on("moveend zoomend", onChange);
        return () => {
          map.off("moveend zoomend", onChange);
        };
      },
      [map],
    ),
    () => {
      const b = map.getBounds();
      return `${Math.round(map.getZoom())}|${b.getWest().toFixed(6)}|${b.getSouth().toFixed(6)}|${b.getEast().toFixed(6)}|${b.getNorth().toFixed(6)}`;
    },
  );
  const view = useMemo(() => {
    const [z, w, s, e, n] = snapshot.split("|").map(Number);
    return { bbox: [w, s, e, n] as [number, number, number, number], zoom: z };
  }, [snapshot]);
  useEffect(() => {
    onView({ bounds: L.latLngBounds([view.bbox[1], view.bbox[0]], [view.bbox[3], view.bbox[2]]), zoom: view.zoom });
  }, [view, onView]);

  const index = useMemo(() => {
    const idx = new Supercluster<StationPointProps, ClusterSummary>({ radius: 44, maxZoom: 16, ...PHASE_CLUSTER_OPTIONS });
    idx.load(stations.map((s) => ({ type: "Feature", geometry: { type: "Point", coordinates: [s.lon, s.lat] }, properties: stationPointProps(s, candidates) })));
    return idx;
  }, [stations, candidates]);
  const byKey = useMemo(() => new Map(stations.map((s) => [s.key, s])), [stations]);
  const features = useMemo(() => {
    const [w, s, e, n] = view.bbox;
    return index.getClusters([Math.max(-180, w), Math.max(-85, s), Math.min(180, e), Math.min(85, n)], view.zoom);
  }, [index, view]);

  return (
    <>
      {features.map((f) => {
        const [lon, lat] = f.geometry.coordinates;
        const p = f.properties as Partial<ClusterSummary & StationPointProps & { cluster: boolean; cluster_id: number; point_count: number }>;
        if (p.cluster) {
          const d = clusterSymbolSvg(clusterSegments(p as ClusterSummary, { candidates }), p.point_count ?? 0);
          const title = `${p.point_count} stations, ${p.samples} samples — click to zoom in`;
          return (
            <Marker
              key={`c${p.cluster_id}`}
              position={[lat, lon]}
              icon={iconFor(d.svg, d.size, `data-cluster="${p.point_count}"`)}
              title={title}
              alt={title}
              eventHandlers={{ click: () => map.flyTo([lat, lon], Math.min(index.getClusterExpansionZoom(p.cluster_id!), 18)) }}
            />
          );
        }
        const st = byKey.get(p.key!);
        if (!st) return null;
        const segs = stationSegments(st, { candidates, mineral });
        const d = stationSymbolSvg(segs);
        const title = `${st.code}: ${describePhases(st.phases.filter((x) => (candidates || x.kind === "confirmed") && (!mineral || x.mineral === mineral)))}`;
        const selected = st.key === selectedKey;
        return (
          <Marker
            key={st.key}
            position={[lat, lon]}
            icon={iconFor(d.svg, d.size, `data-station="${attr(st.code)}" data-symbols="${attr(segs.map((x) => `${x.symbol}:${x.confirmed ? "c" : "k"}`).join(","))}"${selected ? ' class="lx-selected" style="border-radius:50%;box-shadow:0 0 0 3px #b8561b"' : ""}`)}
            title={title}
            alt={title}
            zIndexOffset={selected ? 1000 : 0}
            eventHandlers={{ click: () => onSelect(st.key) }}
          />
        );
      })}
    </>
  );
}

/**
 * Fits the map to the stations once, when the first non-empty list arrives. Waits a frame and re-reads
 * the container size first: on a client-side navigation the map can mount before its box has a size,
 * and a fit computed for a 0 × 0 map ends at world zoom.
 */
export function FitToStations({ points }: { points: readonly [number, number][] }) {
  const map = useMap();
  const done = useRef(false);
  useEffect(() => {
    if (done.current || points.length === 0) return;
    let frame = 0;
    const fit = () => {
      map.invalidateSize();
      if (map.getSize().x === 0 || map.getSize().y === 0) {
        frame = requestAnimationFrame(fit);
        return;
      }
      done.current = true;
      if (points.length === 1) map.setView(points[0], 14);
      else map.fitBounds(L.latLngBounds(points as [number, number][]), { padding: [30, 30], maxZoom: 15 });
    };
    frame = requestAnimationFrame(fit);
    return () => cancelAnimationFrame(frame);
  }, [points, map]);
  return null;
}

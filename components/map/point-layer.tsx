"use client";

import L from "leaflet";
import Link from "next/link";
import { useEffect, useMemo, useState } from "react";
import { Marker, Popup, useMap } from "react-leaflet";
import Supercluster, { type ClusterProperties, type PointFeature } from "supercluster";
import { SAMPLE_STATUS_LABELS, SAMPLE_TYPE_LABELS } from "@/lib/format";
import { clusterSvg, sampleSymbol, symbolSvg, type SymbolKind } from "./marker-symbols";
import type { MapSample, MapStation } from "./types";

type PointProps = { kind: "station"; station: MapStation } | { kind: "sample"; sample: MapSample };
type ClusterProps = { stations: number };

/** Beyond this zoom points are no longer merged; a cluster that still holds several points is a stack at one spot. */
const CLUSTER_MAX_ZOOM = 16;

const iconCache = new Map<string, L.DivIcon>();
function symbolIcon(kind: SymbolKind, highlight = false): L.DivIcon {
  const key = `${kind}:${highlight}`;
  let icon = iconCache.get(key);
  if (!icon) {
    const size = kind === "station" ? 22 : 18;
    icon = L.divIcon({ html: symbolSvg(kind, size, highlight), className: "lx-symbol", iconSize: [size, size], iconAnchor: [size / 2, size / 2], popupAnchor: [0, -size / 2] });
    iconCache.set(key, icon);
  }
  return icon;
}

function clusterIcon(count: number, stations: number): L.DivIcon {
  const { svg, size } = clusterSvg(count, stations > 0);
  return L.divIcon({ html: svg, className: "lx-cluster", iconSize: [size, size], iconAnchor: [size / 2, size / 2] });
}

function SampleLinks({ projectId, samples }: { projectId: string; samples: MapSample[] }) {
  return (
    <ul className="max-h-40 overflow-y-auto text-xs">
      {samples.slice(0, 30).map((s) => (
        <li key={s.id}>
          <Link href={`/projects/${projectId}/samples/${s.id}`} className="font-medium text-brand hover:underline">
            {s.code}
          </Link>{" "}
          · {SAMPLE_TYPE_LABELS[s.sampleType as keyof typeof SAMPLE_TYPE_LABELS] ?? s.sampleType}
        </li>
      ))}
      {samples.length > 30 && <li className="text-muted">… and {samples.length - 30} more</li>}
    </ul>
  );
}

export interface PointLayerProps {
  projectId: string;
  stations: MapStation[];
  samples: MapSample[];
  canEditStations: boolean;
  /** Station being moved: drawn apart, draggable, at `movePosition`. */
  movingStationId: string | null;
  movePosition: [number, number] | null;
  onMoveStart: (station: MapStation) => void;
  onMoveDrag: (lat: number, lon: number) => void;
}

/**
 * Stations and samples, clustered with supercluster. Samples placed at their station's position are
 * listed in the station's popup instead of being drawn on top of it.
 */
export function PointLayer({ projectId, stations, samples, canEditStations, movingStationId, movePosition, onMoveStart, onMoveDrag }: PointLayerProps) {
  const map = useMap();
  const [view, setView] = useState(() => ({ bounds: map.getBounds(), zoom: map.getZoom() }));
  // A stable listener: one re-subscribed on every render can miss a moveend fired from another effect.
  useEffect(() => {
    const sync = () => setView({ bounds: map.getBounds(), zoom: map.getZoom() });
    map.on("moveend", sync);
    sync();
    return () => {
      map.off("moveend", sync);
    };
  }, [map]);

  const samplesAtStation = useMemo(() => {
    const by = new Map<string, MapSample[]>();
    for (const s of samples) if (s.stationCode) (by.get(s.stationCode) ?? by.set(s.stationCode, []).get(s.stationCode)!).push(s);
    return by;
  }, [samples]);

  const index = useMemo(() => {
    const points: PointFeature<PointProps>[] = [];
    for (const st of stations) {
      if (st.id === movingStationId) continue;
      points.push({ type: "Feature", geometry: { type: "Point", coordinates: [st.lon, st.lat] }, properties: { kind: "station", station: st } });
    }
    for (const s of samples) {
      if (s.positionSource === "station") continue;
      points.push({ type: "Feature", geometry: { type: "Point", coordinates: [s.lon, s.lat] }, properties: { kind: "sample", sample: s } });
    }
    const sc = new Supercluster<PointProps, ClusterProps>({
      radius: 48,
      maxZoom: CLUSTER_MAX_ZOOM,
      map: (p) => ({ stations: p.kind === "station" ? 1 : 0 }),
      reduce: (acc, p) => {
        acc.stations += p.stations;
      },
    });
    sc.load(points);
    return sc;
  }, [stations, samples, movingStationId]);

  const b = view.bounds;
  const clusters = index.getClusters([Math.max(-180, b.getWest()), Math.max(-85, b.getSouth()), Math.min(180, b.getEast()), Math.min(85, b.getNorth())], Math.round(view.zoom));
  const moving = movingStationId ? stations.find((s) => s.id === movingStationId) : undefined;

  const stationPopup = (st: MapStation) => {
    const here = samplesAtStation.get(st.code) ?? [];
    return (
      <Popup>
        <div className="space-y-1 text-sm">
          <p className="font-semibold">
            <Link href={`/projects/${projectId}/stations/${st.id}`} className="text-brand hover:underline">
              Station {st.code}
            </Link>
          </p>
          {st.name && <p>{st.name}</p>}
          <p className="text-xs text-muted">
            {st.lat.toFixed(6)}, {st.lon.toFixed(6)} · {here.length} sample{here.length === 1 ? "" : "s"}
          </p>
          {here.length > 0 && <SampleLinks projectId={projectId} samples={here} />}
          {canEditStations && (
            <button type="button" className="mt-1 rounded border border-line px-2 py-1 text-xs font-medium hover:bg-stone" onClick={() => onMoveStart(st)}>
              Move station…
            </button>
          )}
        </div>
      </Popup>
    );
  };

  return (
    <>
      {clusters.map((c) => {
        const [lon, lat] = c.geometry.coordinates;
        const p = c.properties as Partial<ClusterProperties & ClusterProps> & Partial<PointProps>;
        if (p.cluster) {
          const id = p.cluster_id!;
          const count = p.point_count!;
          const expandable = index.getClusterExpansionZoom(id) <= CLUSTER_MAX_ZOOM;
          const title = `${count} points${p.stations ? `, ${p.stations} station${p.stations === 1 ? "" : "s"}` : ""}`;
          return (
            <Marker
              key={`c${id}`}
              position={[lat, lon]}
              icon={clusterIcon(count, p.stations ?? 0)}
              title={title}
              alt={title}
              eventHandlers={expandable ? { click: () => map.flyTo([lat, lon], index.getClusterExpansionZoom(id)) } : undefined}
            >
              {!expandable && (
                <Popup>
                  <p className="mb-1 text-sm font-semibold">{count} points at this spot</p>
                  <SampleLinks projectId={projectId} samples={index.getLeaves(id, 100).flatMap((l) => (l.properties.kind === "sample" ? [l.properties.sample] : []))} />
                  {index
                    .getLeaves(id, 100)
                    .flatMap((l) => (l.properties.kind === "station" ? [l.properties.station] : []))
                    .map((st) => (
                      <p key={st.id} className="text-xs">
                        <Link href={`/projects/${projectId}/stations/${st.id}`} className="font-medium text-brand hover:underline">
                          Station {st.code}
                        </Link>
                      </p>
                    ))}
                </Popup>
              )}
            </Marker>
          );
        }
        if (p.kind === "station") {
          const st = p.station!;
          return (
            <Marker key={`st${st.id}`} position={[lat, lon]} icon={symbolIcon("station")} title={`Station ${st.code}`} alt={`Station ${st.code}`} zIndexOffset={500}>
              {stationPopup(st)}
            </Marker>
          );
        }
        const s = (p as { sample: MapSample }).sample;
        return (
          <Marker key={`sa${s.id}`} position={[lat, lon]} icon={symbolIcon(sampleSymbol(s.sampleType))} title={`Sample ${s.code}`} alt={`Sample ${s.code}`}>
            <Popup>
              <div className="space-y-1 text-sm">
                <p className="font-semibold">
                  <Link href={`/projects/${projectId}/samples/${s.id}`} className="text-brand hover:underline">
                    {s.code}
                  </Link>
                </p>
                <p className="text-xs">
                  {SAMPLE_TYPE_LABELS[s.sampleType as keyof typeof SAMPLE_TYPE_LABELS] ?? s.sampleType} · {SAMPLE_STATUS_LABELS[s.status as keyof typeof SAMPLE_STATUS_LABELS] ?? s.status}
                </p>
                {s.stationCode && <p className="text-xs text-muted">Station {s.stationCode}</p>}
              </div>
            </Popup>
          </Marker>
        );
      })}
      {moving && movePosition && (
        <Marker
          position={movePosition}
          icon={symbolIcon("station", true)}
          draggable
          title={`Moving station ${moving.code}: drag, or click the map`}
          alt={`Moving station ${moving.code}`}
          zIndexOffset={1000}
          eventHandlers={{
            dragend: (e) => {
              const ll = (e.target as L.Marker).getLatLng();
              onMoveDrag(ll.lat, ll.lng);
            },
          }}
        />
      )}
    </>
  );
}

"use client";

import "leaflet/dist/leaflet.css";
import type L from "leaflet";
import { useCallback, useMemo, useRef, useState } from "react";
import { MapContainer, ScaleControl } from "react-leaflet";
import { OfflineBasemapLayer } from "@/components/map/offline-basemap-layer";
import { OFFLINE_TILE_ATTRIBUTION } from "@/lib/map/offline-tiles";
import type { PhaseMapStation } from "@/lib/phase-map";
import { ExportMenu } from "./export-menu";
import { PhaseFilterPanel } from "./filter-panel";
import { PhaseLegend } from "./legend";
import { FitToStations, PhaseLayer, type ViewState } from "./phase-layer";
import { SharePanel } from "./share-panel";
import { StationList } from "./station-list";
import { StationPanel } from "./station-panel";
import { useMineralOptions, usePhaseFilterQuery, usePhaseMap } from "./use-phase-map";

export interface PhaseMapViewProps {
  projectId: string;
  canShare: boolean;
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);

/** Where each mineral was found: phase symbols on the offline basemap, filters, legend, a list that follows the view, station details. */
export default function PhaseMapView({ projectId, canShare }: PhaseMapViewProps) {
  const { query, params } = usePhaseFilterQuery();
  const mapQ = usePhaseMap(projectId, query);
  const mineralsQ = useMineralOptions(projectId, params);
  const stations = useMemo(() => mapQ.data?.stations ?? [], [mapQ.data]);
  const [selected, setSelected] = useState<string | null>(null);
  const [view, setView] = useState<ViewState | null>(null);
  const mapRef = useRef<L.Map | null>(null);
  const candidates = (params.phase ?? "confirmed") !== "confirmed";
  const mineral = params.mineral ?? null;

  const inView = useMemo(() => (view ? stations.filter((s) => view.bounds.contains([s.lat, s.lon])) : stations), [stations, view]);
  const points = useMemo<[number, number][]>(() => stations.map((s) => [s.lat, s.lon]), [stations]);
  const onView = useCallback((v: ViewState) => setView(v), []);
  const select = useCallback((s: PhaseMapStation) => {
    setSelected(s.key);
    mapRef.current?.panTo([s.lat, s.lon]);
  }, []);
  const totals = mapQ.data?.totals;

  return (
    <div className="space-y-3">
      <PhaseFilterPanel params={params} minerals={mineralsQ.data?.items ?? []} />
      <div className="flex flex-wrap items-center justify-between gap-2">
        <p className="text-sm text-muted" aria-live="polite" data-testid="phase-map-summary">
          {mapQ.isFetching && !mapQ.data ? "Loading…" : totals ? `${totals.stations} stations, ${totals.samples} samples${totals.unlocatedSamples ? ` (${totals.unlocatedSamples} without a position are not drawn)` : ""}` : ""}
        </p>
        <ExportMenu base={`/api/projects/${projectId}/exports`} query={query} />
      </div>
      {mapQ.error && (
        <p role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
          {(mapQ.error as Error).message}
        </p>
      )}
      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_340px]">
        <div className="space-y-3">
          <div className="relative h-[64vh] min-h-[360px] overflow-hidden rounded-lg border border-line bg-[#dfe6e4]" aria-busy={mapQ.isFetching}>
            <MapContainer id="phase-map" ref={mapRef} center={[20, 0]} zoom={2} minZoom={1} maxZoom={18} className="h-full w-full" aria-label="Phase map">
              <OfflineBasemapLayer attribution={escapeHtml(OFFLINE_TILE_ATTRIBUTION)} maxZoom={18} />
              <ScaleControl position="bottomleft" imperial={false} />
              <FitToStations points={points} />
              <PhaseLayer stations={stations} candidates={candidates} mineral={mineral} selectedKey={selected} onSelect={(k) => setSelected(k)} onView={onView} />
            </MapContainer>
          </div>
          <PhaseLegend stations={stations} />
        </div>
        <aside className="space-y-3" aria-label="Stations">
          {selected && <StationPanel projectId={projectId} stationKey={selected} query={query} onClose={() => setSelected(null)} />}
          <StationList stations={inView} total={stations.length} selectedKey={selected} onSelect={select} />
          {canShare && <SharePanel projectId={projectId} params={params} />}
        </aside>
      </div>
    </div>
  );
}

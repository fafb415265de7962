"use client";

import "leaflet/dist/leaflet.css";
import { useQueryClient } from "@tanstack/react-query";
import { sampleKeys, stationKeys } from "@/lib/client/query-keys";
import type L from "leaflet";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useCallback, useMemo, useRef, useState } from "react";
import { LayersControl, MapContainer, Rectangle, ScaleControl, TileLayer } from "react-leaflet";
import { Button, buttonClass } from "@/components/ui/button";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { listSavedAreas } from "@/lib/client/offline-areas";
import { OFFLINE_TILE_ATTRIBUTION } from "@/lib/map/offline-tiles";
import { basemapSource, packageSource } from "@/lib/map/tile-sources";
import { cn } from "@/lib/utils";
import { bboxParam, distanceM, escapeHtml, formatDistance, inBBox } from "./geo-utils";
import { AreaSelect, ClickPicker, FitOnce, PendingMarker } from "./map-interactions";
import { SYMBOL_LABELS, symbolSvg, type SymbolKind } from "./marker-symbols";
import { NewStationForm } from "./new-station-form";
import { OfflineAreaDialog, useSavedAreas } from "./offline-area-dialog";
import { OfflineBasemapLayer } from "./offline-basemap-layer";
import { PointLayer } from "./point-layer";
import { STRUCTURE_MIN_ZOOM, StructureLayer, StructureLegendRows, useStructures } from "./structure-layer";
import { TilePackagesPanel } from "./tile-packages-panel";
import type { BBox, MapMode, MapStation } from "./types";
import { useMapSamples, useStations, useTilePackages } from "./use-map-data";

export interface ProjectMapProps {
  projectId: string;
  /** Register filters (query string, no paging) restricting the samples shown. */
  filterQuery: string;
  canEditStations: boolean;
  canManageTiles: boolean;
}

const WORLD: L.LatLngBoundsExpression = [
  [-60, -170],
  [75, 170],
];

/** Where the map opened last time for this project (the extent of its stations and samples), [west, south, east, north]. */
const extentKey = (projectId: string) => `lithodex.map-extent.${projectId}`;
function rememberedExtent(projectId: string): BBox | null {
  try {
    const v = JSON.parse(localStorage.getItem(extentKey(projectId)) ?? "null") as unknown;
    return Array.isArray(v) && v.length === 4 && v.every(Number.isFinite) ? (v as BBox) : null;
  } catch {
    return null;
  }
}

function Legend({ showStructures, onToggleStructures, structureCount }: { showStructures: boolean; onToggleStructures: (v: boolean) => void; structureCount: number }) {
  const kinds: SymbolKind[] = ["station", "rock", "soil", "stream", "float", "other"];
  return (
    <section aria-labelledby="legend-title">
      <h2 id="legend-title" className="mb-1 font-semibold">
        Legend
      </h2>
      <ul className="space-y-1 text-xs">
        {kinds.map((k) => (
          <li key={k} className="flex items-center gap-2">
            <span dangerouslySetInnerHTML={{ __html: symbolSvg(k, k === "station" ? 18 : 16) }} />
            {SYMBOL_LABELS[k]}
          </li>
        ))}
        <li className="flex items-center gap-2">
          <span className="inline-flex h-[18px] w-[18px] items-center justify-center rounded-full bg-brand text-[9px] font-bold text-white">12</span>
          Group of nearby points (click to zoom in)
        </li>
      </ul>
      <h3 className="mt-3 mb-1 text-sm font-semibold">Structural measurements</h3>
      <label className="mb-1 flex min-h-6 items-center gap-2 text-xs">
        <input type="checkbox" checked={showStructures} onChange={(e) => onToggleStructures(e.target.checked)} data-testid="toggle-structures" />
        Show strike/dip symbols ({structureCount}; from zoom {STRUCTURE_MIN_ZOOM} in)
      </label>
      <ul className="space-y-1 text-xs">
        <StructureLegendRows />
      </ul>
    </section>
  );
}

/** The project map: offline basemap + MBTiles layers, clustered stations and samples, station placing and moving, area selection. */
export default function ProjectMap({ projectId, filterQuery, canEditStations, canManageTiles }: ProjectMapProps) {
  const router = useRouter();
  const qc = useQueryClient();
  const mapRef = useRef<L.Map | null>(null);
  const stationsQ = useStations(projectId);
  const samplesQ = useMapSamples(projectId, filterQuery);
  const packagesQ = useTilePackages(projectId);
  const structuresQ = useStructures(projectId);
  const [showStructures, setShowStructures] = useState(true);
  const [offlineOpen, setOfflineOpen] = useState(false);
  const [drawingOffline, setDrawingOffline] = useState(false);
  const [mapObj, setMapObj] = useState<L.Map | null>(null);
  const [savedAreas, refreshSavedAreas] = useSavedAreas(projectId);
  // Open at the project's field area straight away (also offline): the extent its stations had last time, else the
  // newest area saved for offline use; the stations' own extent follows once they load.
  const [initialExtent] = useState<BBox | null>(() => {
    const a = listSavedAreas(projectId)[0];
    return rememberedExtent(projectId) ?? (a ? [a.bbox.west, a.bbox.south, a.bbox.east, a.bbox.north] : null);
  });
  const stations = useMemo(() => stationsQ.data ?? [], [stationsQ.data]);
  const samples = useMemo(() => samplesQ.data?.samples ?? [], [samplesQ.data]);

  const [mode, setMode] = useState<MapMode>({ kind: "browse" });
  const [pending, setPending] = useState<[number, number] | null>(null);
  const [movePos, setMovePos] = useState<[number, number] | null>(null);
  const [area, setArea] = useState<BBox | null>(null);
  const [notice, setNotice] = useState<{ tone: "ok" | "error"; text: string } | null>(null);
  const [moving, setMoving] = useState(false);

  const movingStation = mode.kind === "move" ? stations.find((s) => s.id === mode.stationId) : undefined;
  const points = useMemo<[number, number][]>(() => [...stations.map((s) => [s.lat, s.lon] as [number, number]), ...samples.map((s) => [s.lat, s.lon] as [number, number])], [stations, samples]);

  const tileSources = useMemo(() => [basemapSource(), ...(packagesQ.data ?? []).map((p) => packageSource(projectId, p))], [packagesQ.data, projectId]);
  const pointsLoading = stationsQ.isLoading || samplesQ.isLoading;
  const fallbackExtent = useMemo<L.LatLngBoundsExpression>(() => {
    const a = savedAreas[0];
    return a ? [[a.bbox.south, a.bbox.west], [a.bbox.north, a.bbox.east]] : WORLD;
  }, [savedAreas]);
  const onFitted = useCallback((b: BBox) => localStorage.setItem(extentKey(projectId), JSON.stringify(b)), [projectId]);

  const setModeKind = (next: MapMode) => {
    setMode(next);
    setPending(null);
    setMovePos(null);
    if (next.kind !== "select") setArea((a) => (next.kind === "browse" ? a : null));
    mapRef.current?.closePopup();
  };

  const onPick = useCallback(
    (lat: number, lon: number) => {
      if (mode.kind === "place") setPending([lat, lon]);
      if (mode.kind === "move") setMovePos([lat, lon]);
    },
    [mode.kind],
  );

  function registerHref(bbox: BBox): string {
    const q = new URLSearchParams(filterQuery);
    q.set("bbox", bboxParam(bbox));
    return `/projects/${projectId}/samples?${q.toString()}`;
  }

  function filterToView() {
    const b = mapRef.current?.getBounds();
    if (b) router.push(registerHref([b.getWest(), b.getSouth(), b.getEast(), b.getNorth()]));
  }

  async function confirmMove() {
    if (!movingStation || !movePos) return;
    setMoving(true);
    try {
      await fetchJson(`/api/projects/${projectId}/stations/${movingStation.id}`, {
        method: "PATCH",
        json: { version: movingStation.version, lat: Number(movePos[0].toFixed(6)), lon: Number(movePos[1].toFixed(6)), locationSource: "map", horizontalAccuracyM: null, locationFixedAt: null },
      });
      setNotice({ tone: "ok", text: `Station ${movingStation.code} moved.` });
      setModeKind({ kind: "browse" });
    } catch (err) {
      const stale = err instanceof ApiError && err.status === 409;
      setNotice({ tone: "error", text: stale ? `Station ${movingStation.code} was changed by someone else meanwhile; it has been reloaded. Move it again if still needed.` : err instanceof Error ? err.message : "Move failed." });
      if (stale) setModeKind({ kind: "browse" });
    } finally {
      setMoving(false);
      await qc.invalidateQueries({ queryKey: stationKeys.all(projectId) });
      await qc.invalidateQueries({ queryKey: sampleKeys.all(projectId) });
    }
  }

  const inArea = area ? { samples: samples.filter((s) => inBBox(s.lat, s.lon, area)).length, stations: stations.filter((s) => inBBox(s.lat, s.lon, area)).length } : null;
  const packages = packagesQ.data ?? [];
  const loadError = (stationsQ.error ?? samplesQ.error) as Error | null;

  return (
    <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_320px]">
      <div className="space-y-2">
        <div className="flex flex-wrap gap-2" role="toolbar" aria-label="Map tools">
          {canEditStations && (
            <Button variant={mode.kind === "place" ? "primary" : "secondary"} aria-pressed={mode.kind === "place"} onClick={() => setModeKind(mode.kind === "place" ? { kind: "browse" } : { kind: "place" })}>
              {mode.kind === "place" ? "Placing station — click the map" : "Place station"}
            </Button>
          )}
          <Button variant={mode.kind === "select" ? "primary" : "secondary"} aria-pressed={mode.kind === "select"} onClick={() => setModeKind(mode.kind === "select" ? { kind: "browse" } : { kind: "select" })}>
            {mode.kind === "select" ? "Drag on the map to outline an area" : "Select area"}
          </Button>
          <Button variant="secondary" onClick={filterToView}>
            Filter register to this view
          </Button>
          <Button
            variant={offlineOpen ? "primary" : "secondary"}
            aria-pressed={offlineOpen}
            onClick={() => {
              setOfflineOpen((o) => !o);
              setDrawingOffline(false);
              if (mode.kind === "select") setModeKind({ kind: "browse" });
            }}
          >
            Save area offline
          </Button>
          {mode.kind !== "browse" && (
            <Button variant="ghost" onClick={() => setModeKind({ kind: "browse" })}>
              Cancel
            </Button>
          )}
        </div>
        {filterQuery && (
          <p className="text-xs text-muted">
            Showing samples that match the register filter.{" "}
            <Link href={`/projects/${projectId}/map`} className="text-brand hover:underline">
              Show all
            </Link>
          </p>
        )}
        <div className={cn("relative h-[68vh] min-h-[380px] overflow-hidden rounded-lg border border-line bg-[#dfe6e4]", mode.kind !== "browse" && "ring-2 ring-oxide", (mode.kind === "place" || mode.kind === "select") && "[&_.leaflet-marker-pane_.lx-cluster]:pointer-events-none [&_.leaflet-marker-pane_.lx-symbol]:pointer-events-none")}>
          <MapContainer
            id="map"
            ref={(m) => {
              mapRef.current = m;
              if (m !== mapObj) setMapObj(m);
            }}
            {...(initialExtent ? { bounds: [[initialExtent[1], initialExtent[0]], [initialExtent[3], initialExtent[2]]] as L.LatLngBoundsExpression } : { center: [20, 0] as L.LatLngExpression, zoom: 2 })} minZoom={1} maxZoom={19} worldCopyJump={false} className="h-full w-full" aria-label="Project map">
            <LayersControl position="topright">
              <LayersControl.BaseLayer checked name="Offline basemap">
                <OfflineBasemapLayer attribution={escapeHtml(OFFLINE_TILE_ATTRIBUTION)} maxZoom={19} />
              </LayersControl.BaseLayer>
              {packages.map((p) => {
                const b = p.bounds?.split(",").map(Number);
                return (
                  <LayersControl.Overlay key={p.id} name={escapeHtml(p.name)} checked>
                    <TileLayer
                      url={`/api/projects/${projectId}/tile-packages/${p.id}/tiles/{z}/{x}/{y}`}
                      attribution={p.attribution ? escapeHtml(p.attribution) : undefined}
                      maxZoom={19}
                      {...(p.maxZoom != null && { maxNativeZoom: p.maxZoom })}
                      {...(p.minZoom != null && { minNativeZoom: p.minZoom })}
                      {...(b && b.length === 4 && { bounds: [[b[1], b[0]], [b[3], b[2]]] as L.LatLngBoundsExpression })}
                    />
                  </LayersControl.Overlay>
                );
              })}
            </LayersControl>
            <ScaleControl position="bottomleft" imperial={false} />
            <FitOnce points={points} loading={pointsLoading} fallback={fallbackExtent} onFitted={onFitted} />
            <ClickPicker active={mode.kind === "place" || mode.kind === "move"} onPick={onPick} />
            <AreaSelect
              active={mode.kind === "select"}
              value={area}
              onChange={(b) => {
                setArea(b);
                if (drawingOffline) {
                  setDrawingOffline(false);
                  setModeKind({ kind: "browse" });
                }
              }}
            />
            {showStructures && <StructureLayer structures={structuresQ.data ?? []} />}
            {offlineOpen &&
              savedAreas.map((a) => (
                <Rectangle key={a.id} bounds={[[a.bbox.south, a.bbox.west], [a.bbox.north, a.bbox.east]]} pathOptions={{ color: "#1d5c63", weight: 1.5, dashArray: "4 4", fill: false }} interactive={false} />
              ))}
            <PointLayer
              projectId={projectId}
              stations={stations}
              samples={samples}
              canEditStations={canEditStations}
              movingStationId={mode.kind === "move" ? mode.stationId : null}
              movePosition={movePos ?? (movingStation ? [movingStation.lat, movingStation.lon] : null)}
              onMoveStart={(st) => {
                setModeKind({ kind: "move", stationId: st.id });
                setMovePos([st.lat, st.lon]);
              }}
              onMoveDrag={(lat, lon) => setMovePos([lat, lon])}
            />
            {pending && <PendingMarker position={pending} onDrag={(lat, lon) => setPending([lat, lon])} />}
          </MapContainer>
          {offlineOpen && !drawingOffline && (
            <div className="absolute inset-x-2 top-2 z-[1000] max-h-[calc(100%-5rem)] overflow-y-auto overscroll-contain sm:top-auto sm:bottom-2 sm:right-auto sm:w-[380px]" data-testid="offline-area-panel">
              <OfflineAreaDialog
                projectId={projectId}
                map={mapObj}
                drawn={area}
                onDraw={() => {
                  setDrawingOffline(true);
                  setModeKind({ kind: "select" });
                }}
                sources={tileSources}
                areas={savedAreas}
                onAreasChanged={refreshSavedAreas}
                onShow={(b) => mapRef.current?.fitBounds([[b.south, b.west], [b.north, b.east]])}
                onClose={() => setOfflineOpen(false)}
              />
            </div>
          )}
          {drawingOffline && (
            <p className="absolute inset-x-2 top-2 z-[1000] rounded bg-oxide-light px-2 py-2 text-sm shadow sm:top-auto sm:bottom-2 sm:right-auto sm:w-[380px]" role="status">
              Drag on the map to outline the area to keep offline.
            </p>
          )}
          {(stationsQ.isLoading || samplesQ.isLoading) && (
            <p className="absolute bottom-2 left-1/2 z-[1000] -translate-x-1/2 rounded bg-white/90 px-2 py-1 text-xs shadow" role="status">
              Loading stations and samples…
            </p>
          )}
        </div>
        <p className="text-xs text-muted">
          {stations.length} stations · {samples.length} located samples
          {samplesQ.data?.unlocated ? ` · ${samplesQ.data.unlocated} without a position (not shown)` : ""}
        </p>
      </div>

      <aside className="space-y-4">
        {notice && (
          <p role={notice.tone === "error" ? "alert" : "status"} className={cn("rounded px-2 py-1 text-sm", notice.tone === "ok" ? "bg-brand-light text-ink" : "bg-red-50 text-danger")}>
            {notice.text}
          </p>
        )}
        {loadError && (
          <p role="alert" className="rounded bg-red-50 px-2 py-1 text-sm text-danger">
            {loadError.message}
          </p>
        )}

        {mode.kind === "place" && !pending && <p className="rounded bg-oxide-light px-2 py-2 text-sm">Click the map where the station is. You can adjust the pin and the coordinates before saving.</p>}
        {mode.kind === "place" && pending && (
          <NewStationForm
            projectId={projectId}
            position={pending}
            onPosition={(lat, lon) => Number.isFinite(lat) && Number.isFinite(lon) && setPending([lat, lon])}
            onCancel={() => setModeKind({ kind: "browse" })}
            onCreated={async (s) => {
              setNotice({ tone: "ok", text: `Station ${s.code} created.` });
              setModeKind({ kind: "browse" });
              await qc.invalidateQueries({ queryKey: stationKeys.all(projectId) });
            }}
          />
        )}

        {mode.kind === "move" && movingStation && movePos && (
          <section className="space-y-2 rounded border border-oxide bg-oxide-light p-3 text-sm" aria-label="Move station">
            <h2 className="font-semibold">Move station {movingStation.code}</h2>
            <p>Drag the highlighted diamond or click the map for the new position.</p>
            <dl className="grid grid-cols-[auto_1fr] gap-x-2 text-xs tabular-nums">
              <dt>From</dt>
              <dd>
                {movingStation.lat.toFixed(6)}, {movingStation.lon.toFixed(6)}
              </dd>
              <dt>To</dt>
              <dd>
                {movePos[0].toFixed(6)}, {movePos[1].toFixed(6)}
              </dd>
              <dt>Shift</dt>
              <dd>{formatDistance(distanceM(movingStation.lat, movingStation.lon, movePos[0], movePos[1]))}</dd>
            </dl>
            <p className="text-xs text-muted">Samples without their own position move with the station.</p>
            <div className="flex gap-2">
              <Button onClick={confirmMove} disabled={moving || (movePos[0] === movingStation.lat && movePos[1] === movingStation.lon)}>
                {moving ? "Saving…" : "Confirm move"}
              </Button>
              <Button variant="secondary" onClick={() => setModeKind({ kind: "browse" })}>
                Cancel
              </Button>
            </div>
          </section>
        )}

        {area && inArea && (
          <section className="space-y-2 rounded border border-line bg-white p-3 text-sm" aria-label="Selected area">
            <h2 className="font-semibold">Selected area</h2>
            <p className="text-xs tabular-nums text-muted">W {area[0].toFixed(4)} · S {area[1].toFixed(4)} · E {area[2].toFixed(4)} · N {area[3].toFixed(4)}</p>
            <p>
              {inArea.samples} sample{inArea.samples === 1 ? "" : "s"} and {inArea.stations} station{inArea.stations === 1 ? "" : "s"} inside.
            </p>
            <div className="flex flex-wrap gap-2">
              <Link className={buttonClass("primary")} href={registerHref(area)}>
                Open in register
              </Link>
              <Button variant="secondary" onClick={() => setArea(null)}>
                Clear
              </Button>
            </div>
            <p className="text-xs text-muted">The register counts a sample by its own position.</p>
          </section>
        )}

        <Legend showStructures={showStructures} onToggleStructures={setShowStructures} structureCount={structuresQ.data?.length ?? 0} />

        <section aria-labelledby="st-title">
          <h2 id="st-title" className="mb-1 font-semibold">
            Stations ({stations.length})
          </h2>
          <ul className="max-h-64 space-y-0.5 overflow-y-auto text-sm" data-testid="station-list">
            {[...stations]
              .sort((a, b) => a.code.localeCompare(b.code))
              .map((s: MapStation) => (
                <li key={s.id} className="flex items-center justify-between gap-2">
                  <Link href={`/projects/${projectId}/stations/${s.id}`} prefetch={false} className="inline-block min-h-6 truncate py-0.5 text-brand hover:underline">
                    {s.code}
                    {s.name ? ` — ${s.name}` : ""}
                  </Link>
                  <button type="button" className="min-h-6 shrink-0 px-1.5 text-xs text-muted hover:text-ink" onClick={() => mapRef.current?.flyTo([s.lat, s.lon], Math.max(mapRef.current.getZoom(), 17))} aria-label={`Locate ${s.code} on the map`}>
                    Locate
                  </button>
                </li>
              ))}
          </ul>
        </section>

        <TilePackagesPanel projectId={projectId} packages={packages} canManage={canManageTiles} />
      </aside>
    </div>
  );
}

"use client";

import L from "leaflet";
import { useEffect, useRef, useState } from "react";
import { Marker, Rectangle, useMap, useMapEvents } from "react-leaflet";
import type { BBox } from "./types";

/** Calls `onPick` with the clicked position while `active`; the cursor turns into a crosshair. */
export function ClickPicker({ active, onPick }: { active: boolean; onPick: (lat: number, lon: number) => void }) {
  const map = useMap();
  useEffect(() => {
    const el = map.getContainer();
    el.style.cursor = active ? "crosshair" : "";
    return () => {
      el.style.cursor = "";
    };
  }, [active, map]);
  useMapEvents({
    click: (e) => {
      if (active) onPick(e.latlng.lat, e.latlng.lng);
    },
  });
  return null;
}

let defaultIconReady = false;
/** Leaflet's default marker images, copied to public/leaflet (bundlers break the built-in paths). */
function useDefaultIcon() {
  if (!defaultIconReady) {
    L.Icon.Default.mergeOptions({ iconUrl: "/leaflet/marker-icon.png", iconRetinaUrl: "/leaflet/marker-icon-2x.png", shadowUrl: "/leaflet/marker-shadow.png" });
    defaultIconReady = true;
  }
}

/** The position being picked for a new station; draggable to fine-tune. */
export function PendingMarker({ position, onDrag }: { position: [number, number]; onDrag: (lat: number, lon: number) => void }) {
  useDefaultIcon();
  return (
    <Marker
      position={position}
      draggable
      title="New station position: drag to adjust"
      alt="New station position"
      eventHandlers={{
        dragend: (e) => {
          const ll = (e.target as L.Marker).getLatLng();
          onDrag(ll.lat, ll.lng);
        },
      }}
    />
  );
}

/**
 * Draw-a-rectangle selection: while `active`, press and drag on the map (mouse, pen or finger) to
 * outline an area; map panning is paused meanwhile.
 */
export function AreaSelect({ active, value, onChange }: { active: boolean; value: BBox | null; onChange: (bbox: BBox) => void }) {
  const map = useMap();
  const [draft, setDraft] = useState<L.LatLngBounds | null>(null);
  const onChangeRef = useRef(onChange);
  useEffect(() => {
    onChangeRef.current = onChange;
  }, [onChange]);

  useEffect(() => {
    if (!active) return;
    const el = map.getContainer();
    map.dragging.disable();
    map.boxZoom.disable();
    map.doubleClickZoom.disable();
    el.style.cursor = "crosshair";
    el.style.touchAction = "none";
    let start: L.LatLng | null = null;
    let startPx: L.Point | null = null;
    const down = (e: PointerEvent) => {
      if (e.button !== 0 || (e.target as HTMLElement).closest(".leaflet-control, .leaflet-popup")) return;
      start = map.mouseEventToLatLng(e);
      startPx = map.mouseEventToContainerPoint(e);
      el.setPointerCapture(e.pointerId);
      e.preventDefault();
    };
    const move = (e: PointerEvent) => {
      if (start) setDraft(L.latLngBounds(start, map.mouseEventToLatLng(e)));
    };
    const up = (e: PointerEvent) => {
      if (!start || !startPx) return;
      const end = map.mouseEventToLatLng(e);
      const dist = startPx.distanceTo(map.mouseEventToContainerPoint(e));
      const b = L.latLngBounds(start, end);
      start = null;
      startPx = null;
      setDraft(null);
      if (dist >= 8) onChangeRef.current([b.getWest(), b.getSouth(), b.getEast(), b.getNorth()]);
    };
    el.addEventListener("pointerdown", down);
    el.addEventListener("pointermove", move);
    el.addEventListener("pointerup", up);
    return () => {
      el.removeEventListener("pointerdown", down);
      el.removeEventListener("pointermove", move);
      el.removeEventListener("pointerup", up);
      map.dragging.enable();
      map.boxZoom.enable();
      map.doubleClickZoom.enable();
      el.style.cursor = "";
      el.style.touchAction = "";
    };
  }, [active, map]);

  return (
    <>
      {draft && <Rectangle bounds={draft} pathOptions={{ color: "#b8561b", weight: 2, dashArray: "6 4", fillOpacity: 0.08 }} interactive={false} />}
      {value && !draft && (
        <Rectangle
          bounds={[
            [value[1], value[0]],
            [value[3], value[2]],
          ]}
          pathOptions={{ color: "#b8561b", weight: 2, fillOpacity: 0.06 }}
          interactive={false}
        />
      )}
    </>
  );
}

/**
 * Fits the map to the points once, when they have loaded (the field area, not the world). Until then the map keeps
 * the view it opened with; with no points at all it fits `fallback`. `onFitted` gets the extent [w, s, e, n].
 */
export function FitOnce({ points, loading = false, fallback, onFitted }: { points: [number, number][]; loading?: boolean; fallback: L.LatLngBoundsExpression; onFitted?: (bbox: BBox) => void }) {
  const map = useMap();
  const done = useRef(false);
  useEffect(() => {
    if (done.current || loading) return;
    done.current = true;
    if (points.length === 0) {
      map.fitBounds(fallback);
      return;
    }
    const b = L.latLngBounds(points);
    if (points.length === 1) map.setView(points[0], 14);
    else map.fitBounds(b, { padding: [30, 30], maxZoom: 15 });
    onFitted?.([b.getWest(), b.getSouth(), b.getEast(), b.getNorth()]);
  }, [points, loading, fallback, map, onFitted]);
  return null;
}

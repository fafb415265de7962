"use client";

import { useQuery } from "@tanstack/react-query";
import { structureKeys } from "@/lib/client/query-keys";
import L from "leaflet";
import { useState } from "react";
import { Marker, useMapEvents } from "react-leaflet";
import { fetchJson } from "@/lib/client/fetch-json";
import { formatAttitude, strikeFromDipDirection } from "@/lib/geo/structure";
import type { MapStructure } from "@/lib/dal/structures";
import { structureSymbol, structureSymbolSvg, type StructureAttitude } from "@/lib/map/structure-symbols";

export type { MapStructure };

/** Symbols are drawn from this zoom up; further out they would cover each other. */
export const STRUCTURE_MIN_ZOOM = 11;

/** Size on the map: a 48 px strike line and a 16 px dip tick, so the tick clears the 22 px station diamond. */
const SIZE = { half: 24, tick: 16, arrow: 26 };
const BOX = 84;
const PLANE_COLOUR = "#111111";
const LINE_COLOUR = "#5b2a86";

/** Every structural measurement of the project, with its station's position. */
export function useStructures(projectId: string) {
  return useQuery({
    queryKey: structureKeys.map(projectId),
    queryFn: async () => (await fetchJson<{ items: MapStructure[] }>(`/api/projects/${projectId}/structures`)).items,
  });
}

export function attitudeOf(s: MapStructure): StructureAttitude | null {
  if (s.kind === "planar" && s.dipDirection != null && s.dip != null) return { kind: "planar", dipDirection: s.dipDirection, dip: s.dip, overturned: s.overturned };
  if (s.kind === "linear" && s.trend != null && s.plunge != null) return { kind: "linear", trend: s.trend, plunge: s.plunge };
  return null;
}

/** "Bedding S0 180/30 (strike 090) at ST-0004" — what a symbol stands for, in words. */
export function describeStructure(s: MapStructure): string {
  const what = `${s.feature.replace(/_/g, " ").replace(/^./, (c) => c.toUpperCase())}${s.generation ? ` ${s.generation}` : ""}`;
  if (s.kind === "planar" && s.dipDirection != null && s.dip != null) {
    return `${what} ${formatAttitude(s.dipDirection, s.dip)} (dip direction/dip; strike ${String(Math.round(strikeFromDipDirection(s.dipDirection))).padStart(3, "0")})${s.overturned ? ", overturned" : ""} at ${s.stationCode}`;
  }
  if (s.trend != null && s.plunge != null) return `${what} ${formatAttitude(s.trend, s.plunge)} (trend/plunge) at ${s.stationCode}`;
  return `${what} at ${s.stationCode}`;
}

const iconCache = new Map<string, L.DivIcon>();
function iconFor(s: MapStructure): L.DivIcon | null {
  const att = attitudeOf(s);
  if (!att) return null;
  const key = `${att.kind}:${"dipDirection" in att ? `${att.dipDirection}/${att.dip}/${att.overturned}` : `${att.trend}/${att.plunge}`}`;
  let icon = iconCache.get(key);
  if (!icon) {
    const svg = structureSymbolSvg(structureSymbol(att, SIZE), { box: BOX, colour: att.kind === "planar" ? PLANE_COLOUR : LINE_COLOUR });
    icon = L.divIcon({ html: svg, className: "lx-structure", iconSize: [BOX, BOX], iconAnchor: [BOX / 2, BOX / 2] });
    iconCache.set(key, icon);
  }
  return icon;
}

/** Strike/dip and trend/plunge symbols at their stations (drawn above the station markers, letting clicks through). */
export function StructureLayer({ structures }: { structures: MapStructure[] }) {
  const [zoom, setZoom] = useState<number | null>(null);
  const map = useMapEvents({ zoomend: () => setZoom(map.getZoom()) });
  const z = zoom ?? map.getZoom();
  if (z < STRUCTURE_MIN_ZOOM) return null;
  return (
    <>
      {structures.map((s) => {
        const icon = iconFor(s);
        return icon ? <Marker key={s.id} position={[s.lat, s.lon]} icon={icon} interactive={false} keyboard={false} zIndexOffset={1000} alt={describeStructure(s)} title={describeStructure(s)} /> : null;
      })}
    </>
  );
}

/** The legend rows: an inclined plane, a vertical and a horizontal plane, a plunging line. */
export function StructureLegendRows() {
  const rows: [StructureAttitude, string, string][] = [
    [{ kind: "planar", dipDirection: 135, dip: 35 }, PLANE_COLOUR, "Plane (bedding, foliation, joint…): strike line, tick towards the dip, dip in degrees"],
    [{ kind: "planar", dipDirection: 90, dip: 90 }, PLANE_COLOUR, "Vertical plane"],
    [{ kind: "planar", dipDirection: 0, dip: 0 }, PLANE_COLOUR, "Horizontal plane"],
    [{ kind: "linear", trend: 60, plunge: 20 }, LINE_COLOUR, "Line (lineation, fold hinge): arrow along the trend, plunge in degrees"],
  ];
  return (
    <>
      {rows.map(([att, colour, label]) => (
        <li key={label} className="flex items-center gap-2">
          <span
            className="inline-block h-[34px] w-[34px] shrink-0"
            aria-hidden
            dangerouslySetInnerHTML={{ __html: structureSymbolSvg(structureSymbol(att, { half: 11, tick: 6, arrow: 11 }), { box: 34, colour }).replace('font-size="11"', 'font-size="9"') }}
          />
          {label}
        </li>
      ))}
    </>
  );
}

"use client";

import dynamic from "next/dynamic";
import type { PhaseMapViewProps } from "./phase-map-view";

/** Leaflet needs `window`: the phase map loads in the browser only. */
const PhaseMapView = dynamic(() => import("./phase-map-view"), {
  ssr: false,
  loading: () => <div className="h-[64vh] min-h-[360px] animate-pulse rounded-lg border border-line bg-line/40" role="status" aria-label="Loading the phase map" />,
});

export function PhaseMapLoader(props: PhaseMapViewProps) {
  return <PhaseMapView {...props} />;
}

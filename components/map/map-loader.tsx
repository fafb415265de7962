"use client";

import dynamic from "next/dynamic";
import type { ProjectMapProps } from "./project-map";

/** Leaflet touches `window` on import, so the map loads in the browser only. */
const ProjectMap = dynamic(() => import("./project-map"), {
  ssr: false,
  loading: () => (
    <div className="h-[68vh] min-h-[380px] animate-pulse rounded-lg border border-line bg-line/40" role="status" aria-label="Loading the map" />
  ),
});

export function ProjectMapLoader(props: ProjectMapProps) {
  return <ProjectMap {...props} />;
}

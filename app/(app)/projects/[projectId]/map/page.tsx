import type { Metadata } from "next";
import { ProjectMapLoader } from "@/components/map/map-loader";
import { roleAllows } from "@/lib/dal/permissions";
import { getProject } from "@/lib/dal/projects";
import { currentActor } from "@/lib/dal/session";

export const metadata: Metadata = { title: "Map" };

/** Register filters the map passes on to its sample layer (paging and sort do not apply). */
const FILTER_KEYS = ["q", "code", "status", "sampleType", "stationId", "lithology", "alteration", "collector", "from", "to", "bbox"];

export default async function MapPage({ params, searchParams }: { params: Promise<{ projectId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { projectId } = await params;
  const sp = await searchParams;
  const { role } = await getProject(await currentActor(), projectId);
  const filter = new URLSearchParams();
  for (const k of FILTER_KEYS) {
    const v = sp[k];
    if (typeof v === "string" && v !== "") filter.set(k, v);
  }
  return (
    <div className="space-y-3">
      <h1 className="text-2xl font-semibold">Map</h1>
      <ProjectMapLoader projectId={projectId} filterQuery={filter.toString()} canEditStations={roleAllows(role, "station.write")} canManageTiles={roleAllows(role, "tiles.manage")} />
    </div>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { buttonClass } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { inputClass } from "@/components/ui/field";
import { roleAllows } from "@/lib/dal/permissions";
import { getProject } from "@/lib/dal/projects";
import { currentActor, orNotFound } from "@/lib/dal/session";
import { listStations } from "@/lib/dal/stations";
import { formatUtm, toUtm } from "@/lib/geo";
import { formatDate, formatLatLon } from "@/lib/format";

export const metadata: Metadata = { title: "Stations" };

function utm(lat: number, lon: number): string {
  try {
    return formatUtm(toUtm(lat, lon));
  } catch {
    return "—";
  }
}

export default async function StationsPage({ params, searchParams }: { params: Promise<{ projectId: string }>; searchParams: Promise<{ q?: string }> }) {
  const { projectId } = await params;
  const { q } = await searchParams;
  const actor = await currentActor();
  const project = await orNotFound(getProject(actor, projectId));
  const { items, total } = await orNotFound(listStations(actor, projectId, { q }));
  const canWrite = roleAllows(project.role, "station.write");
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold">Stations</h1>
        <span className="text-sm text-muted">{total} in this project</span>
        {canWrite && (
          <Link href={`/projects/${projectId}/stations/new`} className={buttonClass("primary", "ml-auto")}>
            New station
          </Link>
        )}
      </div>
      <form className="flex max-w-md gap-2" role="search" aria-label="Search stations">
        <input name="q" defaultValue={q ?? ""} placeholder="Code, name or lithology" aria-label="Search stations" className={inputClass} />
        <button className={buttonClass("secondary")}>Search</button>
      </form>
      {items.length === 0 ? (
        <Card>
          <p className="text-sm text-muted">{q ? "No station matches." : "No stations yet."}</p>
        </Card>
      ) : (
        <div className="overflow-x-auto rounded-lg border border-line bg-white">
          <table className="w-full text-sm" data-testid="station-table">
            <thead className="bg-stone text-left text-muted">
              <tr>
                <th className="px-3 py-2 font-medium">Code</th>
                <th className="px-3 py-2 font-medium">Name</th>
                <th className="px-3 py-2 font-medium">Position (WGS84)</th>
                <th className="hidden px-3 py-2 font-medium lg:table-cell">UTM</th>
                <th className="hidden px-3 py-2 font-medium md:table-cell">Lithology</th>
                <th className="px-3 py-2 text-right font-medium">Samples</th>
                <th className="hidden px-3 py-2 text-right font-medium sm:table-cell">Structures</th>
                <th className="hidden px-3 py-2 font-medium md:table-cell">Observed</th>
              </tr>
            </thead>
            <tbody>
              {items.map((s) => (
                <tr key={s.id} className="border-t border-line">
                  <td className="px-3 py-2">
                    <Link href={`/projects/${projectId}/stations/${s.id}`} className="font-medium text-brand hover:underline">
                      {s.code}
                    </Link>
                  </td>
                  <td className="px-3 py-2">{s.name ?? "—"}</td>
                  <td className="px-3 py-2 whitespace-nowrap tabular-nums">{formatLatLon(s.lat, s.lon)}</td>
                  <td className="hidden px-3 py-2 whitespace-nowrap text-xs tabular-nums lg:table-cell">{utm(s.lat, s.lon)}</td>
                  <td className="hidden px-3 py-2 md:table-cell">{s.lithology ?? "—"}</td>
                  <td className="px-3 py-2 text-right tabular-nums">{s.sampleCount}</td>
                  <td className="hidden px-3 py-2 text-right tabular-nums sm:table-cell">{s.structureCount}</td>
                  <td className="hidden px-3 py-2 md:table-cell">{formatDate(s.observedAt)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}

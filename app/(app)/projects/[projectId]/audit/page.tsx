import type { Metadata } from "next";
import Link from "next/link";
import { buttonClass } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { showValue } from "@/lib/audit/diff";
import { formatDateTime } from "@/lib/dates";
import { auditFacets, listAudit } from "@/lib/dal/audit-log";
import { AppError } from "@/lib/dal/errors";
import { currentActor, orNotFound } from "@/lib/dal/session";

export const metadata: Metadata = { title: "Audit log" };

type Search = Record<string, string | string[] | undefined>;

const FILTER_KEYS = ["entity", "entityId", "actorId", "action", "from", "to"] as const;

/** Where a record of the log lives in the app, when it has a page. */
function recordHref(projectId: string, entity: string, id: string): string | null {
  const base = `/projects/${projectId}`;
  if (entity === "sample") return `${base}/samples/${id}`;
  if (entity === "station") return `${base}/stations/${id}`;
  if (entity === "submission") return `${base}/submissions/${id}`;
  if (entity === "scan") return `${base}/scans/${id}`;
  return null;
}

const ENTITY_LABELS: Record<string, string> = {
  sample: "Sample",
  sample_import: "Sample import",
  station: "Station",
  structure: "Structure",
  submission: "Submission",
  scan: "Scan",
  phase_result: "Phase",
  photo: "Photo",
  member: "Member",
  invitation: "Invitation",
  share_link: "Share link",
  lab_link: "Lab link",
  tile_package: "Map layer",
  project: "Project",
};

/** The project's audit log: who changed what, when, with before and after (lead, consultant, site admin). */
export default async function AuditPage({ params, searchParams }: { params: Promise<{ projectId: string }>; searchParams: Promise<Search> }) {
  const { projectId } = await params;
  const sp = await searchParams;
  const actor = await currentActor();
  const query: Record<string, string> = {};
  for (const k of [...FILTER_KEYS, "page"]) {
    const v = sp[k];
    if (typeof v === "string" && v.trim()) query[k] = v.trim();
  }
  let data: Awaited<ReturnType<typeof listAudit>> | null = null;
  let problem: string[] = [];
  try {
    data = await orNotFound(listAudit(actor, projectId, query));
  } catch (err) {
    if (!(err instanceof AppError && err.code === "validation_failed")) throw err;
    problem = Object.entries(err.fields ?? {}).map(([k, v]) => `${k}: ${v.join(" ")}`);
  }
  const facets = await orNotFound(auditFacets(actor, projectId));
  const filters = new URLSearchParams(Object.entries(query).filter(([k]) => k !== "page"));
  const pages = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;
  const pageHref = (p: number) => `?${new URLSearchParams({ ...Object.fromEntries(filters), page: String(p) })}`;
  const zone = data?.timeZone ?? "UTC";
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-2xl font-semibold">Audit log</h1>
        <a href={`/api/projects/${projectId}/audit/export?${filters}`} className={buttonClass("secondary")} data-testid="audit-csv">
          Export CSV
        </a>
      </div>
      <p className="text-sm text-muted">
        Every change in the project: who, when, what, and the values before and after. Entries are never changed or removed. Times in {zone}.
      </p>
      <form method="get" className="grid gap-3 rounded-lg border border-line bg-white p-3 sm:grid-cols-3 lg:grid-cols-6" aria-label="Filter the audit log">
        <label className="text-sm">
          <span className="mb-1 block text-muted">Person</span>
          <select name="actorId" defaultValue={query.actorId ?? ""} className={inputClass}>
            <option value="">Anyone</option>
            {facets.people.map((p) => (
              <option key={p.id} value={p.id}>
                {p.name}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          <span className="mb-1 block text-muted">Record type</span>
          <select name="entity" defaultValue={query.entity ?? ""} className={inputClass}>
            <option value="">All</option>
            {facets.entities.map((e) => (
              <option key={e} value={e}>
                {ENTITY_LABELS[e] ?? e}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          <span className="mb-1 block text-muted">Action</span>
          <select name="action" defaultValue={query.action ?? ""} className={inputClass}>
            <option value="">All</option>
            {facets.actions.map((a) => (
              <option key={a} value={a}>
                {a.includes(".") ? `\u00a0\u00a0${a}` : `${a} (all)`}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          <span className="mb-1 block text-muted">From</span>
          <input type="date" name="from" defaultValue={query.from ?? ""} className={inputClass} />
        </label>
        <label className="text-sm">
          <span className="mb-1 block text-muted">To</span>
          <input type="date" name="to" defaultValue={query.to ?? ""} className={inputClass} />
        </label>
        <div className="flex items-end gap-2">
          {query.entityId && <input type="hidden" name="entityId" value={query.entityId} />}
          <button type="submit" className={buttonClass("primary")}>
            Filter
          </button>
          <Link href={`/projects/${projectId}/audit`} className={buttonClass("ghost")}>
            Clear
          </Link>
        </div>
      </form>
      {query.entityId && (
        <p className="text-sm">
          Showing one record only.{" "}
          <Link className="text-brand hover:underline" href={`?${new URLSearchParams(Object.entries(query).filter(([k]) => k !== "entityId" && k !== "page"))}`}>
            Show all records
          </Link>
        </p>
      )}
      {problem.length > 0 && (
        <p role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
          {problem.join(" ")}
        </p>
      )}
      {data && (
        <>
          <p className="text-sm text-muted" data-testid="audit-total">
            {data.total} entr{data.total === 1 ? "y" : "ies"}
          </p>
          <div className="overflow-x-auto rounded-lg border border-line bg-white">
            <table className="w-full min-w-[900px] text-sm">
              <thead className="bg-stone text-left text-xs uppercase tracking-wide text-muted">
                <tr>
                  <th className="px-3 py-2 font-medium">When</th>
                  <th className="px-3 py-2 font-medium">Person</th>
                  <th className="px-3 py-2 font-medium">Action</th>
                  <th className="px-3 py-2 font-medium">Record</th>
                  <th className="px-3 py-2 font-medium">Before → after</th>
                </tr>
              </thead>
              <tbody>
                {data.items.map((e) => {
                  const href = recordHref(projectId, e.entity, e.entityId);
                  const only = `?${new URLSearchParams({ entity: e.entity, entityId: e.entityId })}`;
                  return (
                    <tr key={e.id} className="border-t border-line align-top" data-testid="audit-row">
                      <td className="whitespace-nowrap px-3 py-2">{formatDateTime(e.createdAt, zone)}</td>
                      <td className="px-3 py-2">{e.actorId ? (e.actorName ?? "(removed account)") : <span className="text-muted">Lithodex (automatic)</span>}</td>
                      <td className="px-3 py-2 font-mono text-xs">{e.action}</td>
                      <td className="px-3 py-2">
                        <span className="text-muted">{ENTITY_LABELS[e.entity] ?? e.entity}</span>{" "}
                        {href ? (
                          <Link href={href} className="text-brand hover:underline">
                            {e.record ?? e.entityId.slice(0, 8)}
                          </Link>
                        ) : (
                          <span>{e.record ?? e.entityId.slice(0, 8)}</span>
                        )}{" "}
                        <Link href={only} className="text-xs text-muted hover:underline" title="Only this record's history">
                          history
                        </Link>
                      </td>
                      <td className="px-3 py-2">
                        {e.changes.length === 0 ? (
                          <span className="text-muted">—</span>
                        ) : (
                          <ul className="space-y-0.5">
                            {e.changes.slice(0, 8).map((c) => (
                              <li key={c.field} className="break-words">
                                <span className="font-medium">{c.field}</span>: <span className="text-danger/90 line-through decoration-1">{showValue(c.before, 80)}</span> → <span className="text-ok">{showValue(c.after, 80)}</span>
                              </li>
                            ))}
                            {e.changes.length > 8 && <li className="text-muted">… {e.changes.length - 8} more fields (in the CSV export)</li>}
                          </ul>
                        )}
                      </td>
                    </tr>
                  );
                })}
                {data.items.length === 0 && (
                  <tr>
                    <td colSpan={5} className="px-3 py-8 text-center text-muted">
                      No entries match these filters.
                    </td>
                  </tr>
                )}
              </tbody>
            </table>
          </div>
          {pages > 1 && (
            <nav aria-label="Pages" className="flex items-center justify-end gap-3 text-sm">
              {data.page > 1 && <Link href={pageHref(data.page - 1)}>Previous</Link>}
              <span>
                Page {data.page} of {pages}
              </span>
              {data.page < pages && <Link href={pageHref(data.page + 1)}>Next</Link>}
            </nav>
          )}
        </>
      )}
    </div>
  );
}

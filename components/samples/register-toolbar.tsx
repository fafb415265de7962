"use client";

import Link from "next/link";
import { ExportMenu } from "@/components/phase-map/export-menu";
import { buttonClass } from "@/components/ui/button";
import { SampleRegister, type SampleListItem } from "./sample-register";

/** Register filters without paging: what export, map and labels should cover. */
function filterQuery(query: string): string {
  const q = new URLSearchParams(query);
  q.delete("page");
  q.delete("pageSize");
  return q.toString();
}

/** Export, map, import and label actions above the register; the selection drives label printing. */
export function RegisterToolbar({ projectId, selected, query, canImport }: { projectId: string; selected: SampleListItem[]; query: string; canImport: boolean }) {
  const fq = filterQuery(query);
  const labelsHref = selected.length ? `/projects/${projectId}/labels?ids=${selected.map((s) => s.id).join(",")}` : `/projects/${projectId}/labels${fq ? `?${fq}` : ""}`;
  return (
    <div className="flex flex-wrap items-center gap-2" role="toolbar" aria-label="Register actions">
      <ExportMenu base={`/api/projects/${projectId}/exports`} query={fq} />
      <Link className={buttonClass("secondary")} href={`/projects/${projectId}/map${fq ? `?${fq}` : ""}`}>
        Show on map
      </Link>
      <Link className={buttonClass("secondary")} href={`/projects/${projectId}/phase-map${fq ? `?${fq}` : ""}`}>
        Phase map
      </Link>
      <Link className={buttonClass(selected.length ? "primary" : "secondary")} href={labelsHref}>
        {selected.length ? `Print labels (${selected.length} selected)` : "Print labels for this filter"}
      </Link>
      {canImport && selected.length > 0 && (
        <Link className={buttonClass("secondary")} href={`/projects/${projectId}/submissions/new?sampleIds=${selected.map((s) => s.id).join(",")}`}>
          Submit to lab ({selected.length})
        </Link>
      )}
      {canImport && (
        <Link className={buttonClass("ghost", "ml-auto")} href={`/projects/${projectId}/samples/import`}>
          Import CSV…
        </Link>
      )}
      {new URLSearchParams(query).get("bbox") && (
        <span className="basis-full text-xs text-muted" data-testid="bbox-note">
          Limited to a map area (W,S,E,N {new URLSearchParams(query).get("bbox")}).
        </span>
      )}
    </div>
  );
}

/** The register with its action toolbar (a client wrapper, since the toolbar is a render prop). */
export function SampleRegisterWithActions({ projectId, canImport }: { projectId: string; canImport: boolean }) {
  return <SampleRegister projectId={projectId}>{(selected, query) => <RegisterToolbar projectId={projectId} selected={selected} query={query} canImport={canImport} />}</SampleRegister>;
}

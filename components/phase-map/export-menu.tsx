import { buttonClass } from "@/components/ui/button";
import { EXPORT_FORMATS, type ExportFormat } from "@/lib/export/respond-formats";
import { cn } from "@/lib/utils";

/**
 * Download links for every export format of the current filter. `base` is the export URL without the
 * format ("/api/projects/:id/exports" or "/api/share/:token/export"); `query` the filter query string.
 */
export function ExportMenu({ base, query, className, formats = Object.keys(EXPORT_FORMATS) as ExportFormat[] }: { base: string; query: string; className?: string; formats?: ExportFormat[] }) {
  return (
    <div className={cn("flex flex-wrap items-center gap-2", className)} role="group" aria-label="Download this selection">
      <span className="text-sm text-muted">Download:</span>
      {formats.map((f) => (
        <a key={f} className={buttonClass("secondary", "px-2.5 py-1.5")} href={`${base}/${f}${query ? `?${query}` : ""}`} download data-testid={`export-${f}`}>
          {EXPORT_FORMATS[f].label}
        </a>
      ))}
    </div>
  );
}

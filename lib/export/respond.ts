/**
 * The one way an export leaves the server: format table, format parsing and the streamed Response. Route
 * handlers (member exports, the register's legacy export URL, share links) prepare a RegisterExport through
 * the DAL — which does the filter parsing and the access check — and hand it here.
 */
import { AppError } from "@/lib/dal/errors";
import { writeRegisterCsv } from "./csv-writer";
import { writeRegisterGeoJson } from "./geojson-writer";
import { writeRegisterKml } from "./kml-writer";
import { writeRegisterPdf } from "./pdf-report";
import { ALL_EXPORT_FORMATS, EXPORT_FORMATS, type ExportFormat } from "./respond-formats";
import type { RegisterExport } from "./types";
import { writeRegisterXlsx } from "./xlsx-writer";

/** Validates a format name (422 naming the allowed ones). */
export function parseExportFormat(value: string | null | undefined, allowed: readonly ExportFormat[] = ALL_EXPORT_FORMATS): ExportFormat {
  if (value && (allowed as readonly string[]).includes(value)) return value as ExportFormat;
  throw new AppError("validation_failed", "Some query parameters are not valid.", { format: [`format must be ${allowed.join(", ").replace(/, ([^,]*)$/, " or $1")}.`] });
}

function chunks(exp: RegisterExport, format: ExportFormat, sampleUrl: ((id: string) => string) | null): AsyncIterator<string | Uint8Array> {
  switch (format) {
    case "csv":
      return writeRegisterCsv(exp);
    case "geojson":
      return writeRegisterGeoJson(exp, sampleUrl);
    case "kml":
      return writeRegisterKml(exp, sampleUrl);
    case "xlsx":
      return writeRegisterXlsx(exp);
    case "pdf":
      return writeRegisterPdf(exp);
  }
}

/** File name: "<CODE>-samples-<date>.<ext>" (the PDF: "<CODE>-register-report-<date>.pdf"). */
export function exportFileName(projectCode: string, format: ExportFormat, at: Date): string {
  const date = at.toISOString().slice(0, 10);
  return format === "pdf" ? `${projectCode}-register-report-${date}.pdf` : `${projectCode}-samples-${date}.${EXPORT_FORMATS[format].ext}`;
}

/**
 * A streamed download of the export: pulled page by page as the client reads, so memory stays bounded.
 * @param sampleUrl - link to a sample's page for GeoJSON/KML (null for share links)
 */
export function exportResponse(exp: RegisterExport, format: ExportFormat, options: { sampleUrl: ((id: string) => string) | null }): Response {
  const enc = new TextEncoder();
  const it = chunks(exp, format, options.sampleUrl);
  const body = new ReadableStream<Uint8Array>({
    async pull(controller) {
      try {
        const { value, done } = await it.next();
        if (done) controller.close();
        else controller.enqueue(typeof value === "string" ? enc.encode(value) : value);
      } catch (err) {
        console.error("export failed while streaming:", err);
        controller.error(err);
      }
    },
    async cancel() {
      await it.return?.(undefined);
    },
  });
  return new Response(body, {
    headers: {
      "content-type": EXPORT_FORMATS[format].type,
      "content-disposition": `attachment; filename="${exportFileName(exp.project.code, format, exp.generatedAt)}"`,
      "cache-control": "no-store",
      "x-content-type-options": "nosniff",
    },
  });
}

export { ALL_EXPORT_FORMATS, EXPORT_FORMATS, type ExportFormat };

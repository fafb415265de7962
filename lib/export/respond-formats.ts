/** Export formats: media type, file extension, button label. Pure (safe for client components). */
export const EXPORT_FORMATS = {
  csv: { type: "text/csv; charset=utf-8", ext: "csv", label: "CSV" },
  xlsx: { type: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet", ext: "xlsx", label: "Excel (XLSX)" },
  geojson: { type: "application/geo+json", ext: "geojson", label: "GeoJSON" },
  kml: { type: "application/vnd.google-earth.kml+xml", ext: "kml", label: "KML" },
  pdf: { type: "application/pdf", ext: "pdf", label: "PDF report" },
} as const;
export type ExportFormat = keyof typeof EXPORT_FORMATS;
export const ALL_EXPORT_FORMATS = Object.keys(EXPORT_FORMATS) as ExportFormat[];

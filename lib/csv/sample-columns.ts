/**
 * The register's CSV columns, in order: the export writes exactly these headers and the import
 * recognises them (and common alternatives), so an exported file imports back unchanged. Pure.
 */
import { LOCATION_SOURCES, SAMPLE_STATUSES, SAMPLE_TYPES } from "@/lib/vocabulary";
import { SAMPLE_STATUS_LABELS, SAMPLE_TYPE_LABELS } from "@/lib/format";

/** How a cell is read on import. */
export type CsvValueKind = "text" | "number" | "boolean" | "enum" | "instant" | "zone";

/** Sample fields a CSV column can fill; `stationCode` is resolved to the station by the import. */
export type SampleCsvField =
  | "code"
  | "igsn"
  | "stationCode"
  | "sampleType"
  | "lithology"
  | "alteration"
  | "alterationIntensity"
  | "description"
  | "collectedAt"
  | "collectedTz"
  | "collectorName"
  | "lat"
  | "lon"
  | "elevationM"
  | "horizontalAccuracyM"
  | "locationSource"
  | "storageLocation"
  | "status"
  | "suspectedAsbestos"
  | "weightKg";

export interface SampleCsvColumn {
  /** Header written on export. */
  header: string;
  field: SampleCsvField;
  /** Human label for the mapping screen. */
  label: string;
  kind: CsvValueKind;
  /** Other headers recognised on import (compared after normalising case and punctuation). */
  aliases: string[];
  /** For enums: accepted values → stored value (keys and display labels, lower-cased). */
  values?: Record<string, string>;
}

function enumValues(keys: readonly string[], labels: Record<string, string> = {}, extra: Record<string, string> = {}): Record<string, string> {
  const out: Record<string, string> = {};
  for (const k of keys) {
    out[k] = k;
    out[k.replace(/_/g, " ")] = k;
    if (labels[k]) out[labels[k].toLowerCase()] = k;
  }
  for (const [alias, k] of Object.entries(extra)) out[alias] = k;
  return out;
}

export const SAMPLE_CSV_COLUMNS: readonly SampleCsvColumn[] = [
  { header: "code", field: "code", label: "Sample code", kind: "text", aliases: ["sample_code", "sample_id", "sample", "sample_no", "sample_number"] },
  { header: "igsn", field: "igsn", label: "IGSN", kind: "text", aliases: [] },
  { header: "station_code", field: "stationCode", label: "Station code", kind: "text", aliases: ["station", "station_id", "station_no"] },
  {
    header: "sample_type",
    field: "sampleType",
    label: "Sample type",
    kind: "enum",
    aliases: ["type"],
    values: enumValues(SAMPLE_TYPES, SAMPLE_TYPE_LABELS, { grab: "hand_sample", "grab sample": "hand_sample", "drill core": "core", "stream sed": "stream_sediment", "outcrop chip": "chip", "chip channel": "chip" }),
  },
  { header: "lithology", field: "lithology", label: "Lithology", kind: "text", aliases: ["rock_type", "rock"] },
  { header: "alteration", field: "alteration", label: "Alteration", kind: "text", aliases: [] },
  {
    header: "alteration_intensity",
    field: "alterationIntensity",
    label: "Alteration intensity",
    kind: "enum",
    aliases: ["intensity"],
    values: enumValues(["none", "weak", "moderate", "strong", "intense"]),
  },
  { header: "description", field: "description", label: "Description", kind: "text", aliases: ["remarks", "notes", "comment", "comments"] },
  { header: "collected_at", field: "collectedAt", label: "Collected at (ISO 8601)", kind: "instant", aliases: ["collected", "date_time", "datetime", "date"] },
  { header: "collected_tz", field: "collectedTz", label: "Time zone (IANA)", kind: "zone", aliases: ["time_zone", "timezone", "tz"] },
  { header: "collector", field: "collectorName", label: "Collector", kind: "text", aliases: ["collector_name", "collected_by", "geologist"] },
  { header: "lat", field: "lat", label: "Latitude (WGS84, decimal °)", kind: "number", aliases: ["latitude", "lat_dd", "latitude_wgs84", "lat_wgs84"] },
  { header: "lon", field: "lon", label: "Longitude (WGS84, decimal °)", kind: "number", aliases: ["longitude", "lng", "long", "lon_dd", "longitude_wgs84", "lon_wgs84"] },
  { header: "elevation_m", field: "elevationM", label: "Elevation (m)", kind: "number", aliases: ["elevation", "elev", "altitude", "elev_m"] },
  { header: "horizontal_accuracy_m", field: "horizontalAccuracyM", label: "Horizontal accuracy (m)", kind: "number", aliases: ["accuracy_m", "accuracy", "hacc", "h_acc"] },
  { header: "location_source", field: "locationSource", label: "Location source", kind: "enum", aliases: [], values: enumValues(LOCATION_SOURCES, {}, { gps: "device_gnss", gnss: "device_gnss" }) },
  { header: "storage_location", field: "storageLocation", label: "Storage location", kind: "text", aliases: ["storage"] },
  { header: "status", field: "status", label: "Status", kind: "enum", aliases: [], values: enumValues(SAMPLE_STATUSES, SAMPLE_STATUS_LABELS) },
  { header: "suspected_asbestos", field: "suspectedAsbestos", label: "Suspected asbestos", kind: "boolean", aliases: ["asbestos"] },
  { header: "weight_kg", field: "weightKg", label: "Weight (kg)", kind: "number", aliases: ["weight"] },
];

/** Column definition by field. */
export const SAMPLE_CSV_COLUMN_BY_FIELD: Record<SampleCsvField, SampleCsvColumn> = Object.fromEntries(SAMPLE_CSV_COLUMNS.map((c) => [c.field, c])) as Record<
  SampleCsvField,
  SampleCsvColumn
>;

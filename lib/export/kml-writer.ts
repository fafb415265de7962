/**
 * Register KML (OGC 07-147r2, KML 2.2): a Document with a typed Schema, one Style per phase status and a
 * Placemark per sample carrying the same attributes as the GeoJSON export in ExtendedData/SchemaData.
 * Coordinates are "lon,lat" (WGS84); a sample without any position gets a Placemark without geometry
 * (allowed: a Placemark's Geometry is optional). Written page by page. Pure.
 *
 * Booleans are written "1"/"0": both are xs:boolean lexical forms (KML 2.2 SimpleField type="bool" is
 * xs:boolean), and GDAL's KML and LIBKML drivers read a "bool" field as an integer (boolean subtype), so
 * "true"/"false" came out of ogr2ogr as 0 while "1"/"0" round-trip. collected_at is also the Placemark's
 * <TimeStamp><when> (KML 2.2 §15.2, xs:dateTime in UTC), so time-aware viewers place it on the time line.
 */
import { CONFIRMED_VS_CANDIDATE, IDENTIFICATION_CAVEAT } from "./caveats";
import { isoInstantSeconds } from "@/lib/csv/formula-guard";
import { registerFeature } from "./geojson-writer";
import type { ExportRow, RegisterExport } from "./types";

const xml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&apos;" })[c]!).replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F]/g, "");

/** Attribute types declared in the Schema (KML 2.2 SimpleField types). */
const FIELD_TYPES: Record<string, "string" | "double" | "bool"> = {
  sample_id: "string",
  code: "string",
  igsn: "string",
  sample_type: "string",
  status: "string",
  station_code: "string",
  lithology: "string",
  alteration: "string",
  collected_at: "string",
  collector: "string",
  elevation_m: "double",
  horizontal_accuracy_m: "double",
  suspected_asbestos: "bool",
  position_source: "string",
  url: "string",
  phase_status: "string",
  confirmed_phases: "string",
  confirmed_symbols: "string",
  candidate_phases_unconfirmed: "string",
  asbestiform_phase: "bool",
};

/**
 * KML colours are aabbggrr. Our phase-status styles: confirmed = filled, full opacity; candidate = pale
 * (outline-like) and smaller; none = grey. Colours from Paul Tol's muted scheme (see lib/phase-map/palette).
 */
const STYLES = `<Style id="confirmed"><IconStyle><color>ff552288</color><scale>1.1</scale></IconStyle><LabelStyle><scale>0.8</scale></LabelStyle></Style>
<Style id="candidate"><IconStyle><color>99552288</color><scale>0.8</scale></IconStyle><LabelStyle><scale>0.7</scale></LabelStyle></Style>
<Style id="none"><IconStyle><color>ffdddddd</color><scale>0.6</scale></IconStyle><LabelStyle><scale>0</scale></LabelStyle></Style>`;

/** A safe XML id from a sample code (xs:ID must start with a letter). */
const placemarkId = (code: string) => `s_${code.replace(/[^A-Za-z0-9._-]/g, "_")}`;

export function kmlHeader(exp: Pick<RegisterExport, "project" | "generatedAt">): string {
  const fields = Object.entries(FIELD_TYPES)
    .map(([name, type]) => `<SimpleField type="${type}" name="${name}"/>`)
    .join("");
  return `<?xml version="1.0" encoding="UTF-8"?>
<kml xmlns="http://www.opengis.net/kml/2.2">
<Document>
<name>${xml(`${exp.project.code} sample register`)}</name>
<description>${xml(`${exp.project.name}. Exported ${exp.generatedAt.toISOString()}. ${CONFIRMED_VS_CANDIDATE} ${IDENTIFICATION_CAVEAT}`)}</description>
${STYLES}
<Schema name="lithodex_sample" id="lithodex_sample">${fields}</Schema>
<Folder><name>Samples</name>
`;
}

export const KML_FOOTER = `</Folder>
</Document>
</kml>
`;

/** A SimpleData value: booleans 1/0, instants ISO 8601 UTC to the second, the rest as text. */
function simpleData(key: string, v: string | number | boolean): string {
  if (typeof v === "boolean") return v ? "1" : "0";
  if (key === "collected_at" && typeof v === "string") return isoInstantSeconds(v);
  return String(v);
}

/** One sample as a Placemark. */
export function kmlPlacemark(row: ExportRow, url?: string): string {
  const f = registerFeature(row, url);
  const p = f.properties;
  const data = Object.keys(FIELD_TYPES)
    .filter((k) => p[k] !== null && p[k] !== undefined && p[k] !== "")
    .map((k) => `<SimpleData name="${k}">${xml(simpleData(k, p[k]!))}</SimpleData>`)
    .join("");
  const desc = [
    p.confirmed_phases ? `Confirmed phases (wt%): ${p.confirmed_phases}` : "No confirmed phases.",
    p.candidate_phases_unconfirmed ? `Unconfirmed candidates: ${p.candidate_phases_unconfirmed}` : "",
  ]
    .filter(Boolean)
    .join(" ");
  const when = typeof p.collected_at === "string" ? isoInstantSeconds(p.collected_at) : null;
  const time = when ? `<TimeStamp><when>${xml(when)}</when></TimeStamp>` : "";
  const geom = f.geometry ? `<Point><coordinates>${f.geometry.coordinates[0]},${f.geometry.coordinates[1]}</coordinates></Point>` : "";
  return `<Placemark id="${xml(placemarkId(row.code))}"><name>${xml(row.code)}</name><description>${xml(desc)}</description>${time}<styleUrl>#${p.phase_status}</styleUrl><ExtendedData><SchemaData schemaUrl="#lithodex_sample">${data}</SchemaData></ExtendedData>${geom}</Placemark>\n`;
}

export async function* writeRegisterKml(exp: RegisterExport, sampleUrl: ((id: string) => string) | null): AsyncGenerator<string> {
  yield kmlHeader(exp);
  for await (const page of exp.pages()) yield page.map((r) => kmlPlacemark(r, sampleUrl?.(r.id))).join("");
  yield KML_FOOTER;
}

/**
 * Register GeoJSON (RFC 7946): a FeatureCollection written incrementally, one page of features at a time.
 * Positions [lon, lat] WGS84 (6 decimals), no `crs` member; features from the register's own feature
 * builder (./sample-geojson) plus the phase attributes. Pure.
 */
import { isoInstantSeconds } from "@/lib/csv/formula-guard";
import { phaseAttributes } from "./phase-text";
import { FEATURE_COLLECTION_END, FEATURE_COLLECTION_START, sampleFeature, type GeoJsonPointFeature } from "./sample-geojson";
import type { ExportRow, RegisterExport } from "./types";

/** One register row as a Feature; `url` links back to the sample page (members only). */
export function registerFeature(row: ExportRow, url?: string): GeoJsonPointFeature {
  const f = sampleFeature(row, url);
  // One instant format in every export (ISO 8601 UTC to the second), whether or not the stored value has milliseconds.
  const collected = row.collectedAt ? isoInstantSeconds(row.collectedAt) : null;
  return { ...f, properties: { ...f.properties, collected_at: collected, ...phaseAttributes(row) } };
}

export async function* writeRegisterGeoJson(exp: RegisterExport, sampleUrl: ((id: string) => string) | null): AsyncGenerator<string> {
  yield FEATURE_COLLECTION_START;
  let first = true;
  for await (const page of exp.pages()) {
    if (page.length === 0) continue;
    const text = page.map((r) => JSON.stringify(registerFeature(r, sampleUrl?.(r.id)))).join(",\n");
    yield `${first ? "\n" : ",\n"}${text}`;
    first = false;
  }
  yield FEATURE_COLLECTION_END;
}

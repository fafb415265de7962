/**
 * GeoJSON (RFC 7946) features for register rows. Positions are [longitude, latitude] in WGS84 decimal
 * degrees, rounded to 6 decimals (≈ 0.11 m); no `crs` member. A sample without its own position takes
 * its station's, and says so in `position_source`; a sample with neither has a null geometry (RFC 7946
 * §3.2 allows unlocated features). Pure.
 */

/** The fields a feature is built from. */
export interface GeoJsonSampleInput {
  id: string;
  code: string;
  igsn: string | null;
  sampleType: string;
  status: string;
  lithology: string | null;
  alteration: string | null;
  collectedAt: string | null;
  collectorName: string | null;
  elevationM: number | null;
  horizontalAccuracyM: number | null;
  suspectedAsbestos: boolean;
  lat: number | null;
  lon: number | null;
  stationCode: string | null;
  stationLat: number | null;
  stationLon: number | null;
}

export interface GeoJsonPointFeature {
  type: "Feature";
  id: string;
  geometry: { type: "Point"; coordinates: [number, number] } | null;
  properties: Record<string, string | number | boolean | null>;
}

const round6 = (v: number) => Math.round(v * 1e6) / 1e6;

/** One sample as a GeoJSON Feature; `url` links back to the sample page when given. */
export function sampleFeature(s: GeoJsonSampleInput, url?: string): GeoJsonPointFeature {
  const own = s.lat != null && s.lon != null;
  const station = !own && s.stationLat != null && s.stationLon != null;
  const lon = own ? s.lon! : station ? s.stationLon! : null;
  const lat = own ? s.lat! : station ? s.stationLat! : null;
  return {
    type: "Feature",
    id: s.code,
    geometry: lon !== null && lat !== null ? { type: "Point", coordinates: [round6(lon), round6(lat)] } : null,
    properties: {
      sample_id: s.id,
      code: s.code,
      igsn: s.igsn,
      sample_type: s.sampleType,
      status: s.status,
      station_code: s.stationCode,
      lithology: s.lithology,
      alteration: s.alteration,
      collected_at: s.collectedAt,
      collector: s.collectorName,
      elevation_m: s.elevationM,
      horizontal_accuracy_m: s.horizontalAccuracyM,
      suspected_asbestos: s.suspectedAsbestos,
      position_source: own ? "sample" : station ? "station" : null,
      ...(url ? { url } : {}),
    },
  };
}

/** Text before the first feature of a streamed FeatureCollection. */
export const FEATURE_COLLECTION_START = '{"type":"FeatureCollection","features":[';
/** Text after the last feature. */
export const FEATURE_COLLECTION_END = "]}\n";

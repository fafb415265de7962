import type { ELEVATION_REFS, LOCATION_SOURCES } from "@/lib/vocabulary";

export type LocationSource = (typeof LOCATION_SOURCES)[number];
export type ElevationRef = (typeof ELEVATION_REFS)[number];

export interface LocationValue {
  lat: number | null;
  lon: number | null;
  elevationM: number | null;
  elevationRef: ElevationRef | null;
  horizontalAccuracyM: number | null;
  locationSource: LocationSource | null;
  locationFixedAt: string | null;
}

export const LOCATION_SOURCE_LABELS: Record<LocationSource, string> = {
  device_gnss: "This device (GNSS / browser location)",
  external_gnss: "External GNSS receiver",
  map: "Picked on a map",
  photo_exif: "Photo EXIF",
  legacy: "Copied from legacy data",
  other: "Other",
};

export const ELEVATION_REF_LABELS: Record<ElevationRef, string> = {
  msl: "above mean sea level (maps)",
  ellipsoid: "above WGS84 ellipsoid (raw GNSS)",
};


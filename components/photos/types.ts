/** A photo as the API returns it (lib/dal/photos.ts PhotoView). */
export interface Photo {
  id: string;
  sampleId: string | null;
  stationId: string | null;
  originalName: string;
  mime: string;
  sizeBytes: number;
  width: number | null;
  height: number | null;
  takenAt: string | null;
  takenLocal: string | null;
  takenOffset: string | null;
  gps: { lat: number; lon: number; altitudeM: number | null; horizontalErrorM: number | null } | null;
  imgDirection: number | null;
  imgDirectionRef: string | null;
  caption: string | null;
  createdAt: string;
  urls: { thumb: string; display: string; original: string };
  distanceToStationM: number | null;
  farFromStation: boolean;
}

/** Largest photo accepted (must match lib/photos MAX_PHOTO_BYTES). */
export const MAX_PHOTO_BYTES = 25 * 1024 * 1024;

/** What the project map shows and edits. Coordinates: decimal degrees WGS84. */

export interface MapStation {
  id: string;
  code: string;
  name: string | null;
  lat: number;
  lon: number;
  version: number;
}

export interface MapSample {
  id: string;
  code: string;
  sampleType: string;
  status: string;
  stationCode: string | null;
  lat: number;
  lon: number;
  /** "sample" = own position; "station" = its station's. */
  positionSource: "sample" | "station";
}

export interface TilePackageInfo {
  id: string;
  name: string;
  format: string;
  minZoom: number | null;
  maxZoom: number | null;
  /** "w,s,e,n" */
  bounds: string | null;
  attribution: string | null;
  createdAt: string;
}

/** [west, south, east, north] */
export type BBox = [number, number, number, number];

export type MapMode = { kind: "browse" } | { kind: "place" } | { kind: "move"; stationId: string } | { kind: "select" };

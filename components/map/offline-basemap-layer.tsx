"use client";

import { createElementObject, createTileLayerComponent, updateGridLayer, withPane, type LayerProps } from "@react-leaflet/core";
import L from "leaflet";
import { OFFLINE_MAX_ZOOM, OFFLINE_TILE_SIZE, OFFLINE_TILE_URL_TEMPLATE, offlineTileRanges } from "@/lib/map/offline-tiles";

/** A transparent 1 × 1 GIF for tiles the offline set does not have (no request, no 404 noise). */
const EMPTY_TILE = "data:image/gif;base64,R0lGODlhAQABAIAAAAAAAP///yH5BAEAAAAALAAAAAABAAEAAAIBRAA7";

const RANGES = new Map(offlineTileRanges().map((r) => [r.z, r]));

function covered(z: number, x: number, y: number): boolean {
  const r = RANGES.get(z);
  return !!r && x >= r.xMin && x <= r.xMax && y >= r.yMin && y <= r.yMax;
}

/** Tile layer over the bundled offline tiles that never asks for a tile outside their coverage. */
class OfflineTileLayer extends L.TileLayer {
  getTileUrl(coords: L.Coords): string {
    const z = this._getZoomForUrl();
    return covered(z, coords.x, coords.y) ? super.getTileUrl(coords) : EMPTY_TILE;
  }
}

export interface OfflineBasemapProps extends LayerProps, L.TileLayerOptions {}

/** The default basemap, served from `public/tiles-offline`; works with the network off. */
export const OfflineBasemapLayer = createTileLayerComponent<L.TileLayer, OfflineBasemapProps>(function create(options, context) {
  const layer = new OfflineTileLayer(OFFLINE_TILE_URL_TEMPLATE, withPane({ tileSize: OFFLINE_TILE_SIZE, maxNativeZoom: OFFLINE_MAX_ZOOM, ...options }, context));
  return createElementObject(layer, context);
}, updateGridLayer);

/**
 * Layout of a static map figure: the zoom that fits the points, which tiles cover the frame and where a
 * position lands in it. Web Mercator arithmetic from lib/map/tiles; ground resolution
 * 156 543.03·cos φ / 2^z m/px at 256-px tiles (EPSG:3857, R = 6 378 137 m: 2πR/256). Pure.
 */
import { lonLatToWorldPixel } from "@/lib/map/tiles";

export interface StaticMapLayout {
  zoom: number;
  width: number;
  height: number;
  /** World-pixel position of the frame's top-left corner at `zoom`. */
  originX: number;
  originY: number;
  /** Tiles overlapping the frame, with their pixel offset in the frame (may be negative). */
  tiles: { z: number; x: number; y: number; left: number; top: number }[];
  /** Metres per pixel at the frame centre. */
  metresPerPixel: number;
}

export interface LayoutOptions {
  /** Frame size, px. @default 1000 × 640 */
  width?: number;
  height?: number;
  /** Free margin around the points, px. @default 48 */
  padding?: number;
  /** @default 0 */
  minZoom?: number;
  /** Highest zoom used (the offline tiles stop at 15). @default 15 */
  maxZoom?: number;
  /** Zoom for a single point. @default 13 */
  singlePointZoom?: number;
  /** Used when there are no points: centre of the frame, degrees. */
  fallbackCenter?: { lon: number; lat: number };
  /** @default 256 */
  tileSize?: number;
}

/** Earth equatorial circumference / 256 px (WGS84 spherical Mercator), metres per pixel at zoom 0. */
const M_PER_PX_Z0 = 156543.03392;

/**
 * The largest zoom at which every point fits inside the frame minus padding, centred on their box.
 *
 * @param points - positions, decimal degrees WGS84
 */
export function staticMapLayout(points: readonly { lon: number; lat: number }[], options: LayoutOptions = {}): StaticMapLayout {
  const { width = 1000, height = 640, padding = 48, minZoom = 0, maxZoom = 15, singlePointZoom = 13, fallbackCenter = { lon: 0, lat: 0 }, tileSize = 256 } = options;
  let west = Infinity;
  let east = -Infinity;
  let south = Infinity;
  let north = -Infinity;
  for (const p of points) {
    west = Math.min(west, p.lon);
    east = Math.max(east, p.lon);
    south = Math.min(south, p.lat);
    north = Math.max(north, p.lat);
  }
  const none = points.length === 0;
  const single = !none && east - west < 1e-9 && north - south < 1e-9;
  let zoom = none ? minZoom : single ? Math.min(maxZoom, singlePointZoom) : minZoom;
  if (!none && !single) {
    for (let z = maxZoom; z >= minZoom; z--) {
      const a = lonLatToWorldPixel(west, north, z, tileSize);
      const b = lonLatToWorldPixel(east, south, z, tileSize);
      if (b.px - a.px <= width - 2 * padding && b.py - a.py <= height - 2 * padding) {
        zoom = z;
        break;
      }
    }
  }
  const centre = none ? fallbackCenter : { lon: (west + east) / 2, lat: (south + north) / 2 };
  const c = lonLatToWorldPixel(centre.lon, centre.lat, zoom, tileSize);
  const originX = Math.round(c.px - width / 2);
  const originY = Math.round(c.py - height / 2);
  const n = 2 ** zoom;
  const tiles: StaticMapLayout["tiles"] = [];
  for (let ty = Math.floor(originY / tileSize); ty <= Math.floor((originY + height - 1) / tileSize); ty++) {
    if (ty < 0 || ty >= n) continue;
    for (let tx = Math.floor(originX / tileSize); tx <= Math.floor((originX + width - 1) / tileSize); tx++) {
      const wrapped = ((tx % n) + n) % n;
      tiles.push({ z: zoom, x: wrapped, y: ty, left: tx * tileSize - originX, top: ty * tileSize - originY });
    }
  }
  const lat = Math.max(-85.05, Math.min(85.05, centre.lat));
  const metresPerPixel = (M_PER_PX_Z0 * Math.cos((lat * Math.PI) / 180)) / 2 ** zoom / (tileSize / 256);
  return { zoom, width, height, originX, originY, tiles, metresPerPixel };
}

/** Pixel position of a point in the frame. */
export function framePixel(layout: StaticMapLayout, lon: number, lat: number, tileSize = 256): { x: number; y: number } {
  const p = lonLatToWorldPixel(lon, lat, layout.zoom, tileSize);
  return { x: p.px - layout.originX, y: p.py - layout.originY };
}

/**
 * A "nice" scale-bar length (1, 2 or 5 × 10^k metres) no longer than `maxPx` pixels.
 * @returns metres and pixels
 */
export function scaleBar(metresPerPixel: number, maxPx = 150): { metres: number; px: number } {
  const maxM = metresPerPixel * maxPx;
  const p = 10 ** Math.floor(Math.log10(maxM));
  const m = [5, 2, 1].map((k) => k * p).find((v) => v <= maxM) ?? p;
  return { metres: m, px: m / metresPerPixel };
}

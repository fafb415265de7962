/**
 * Server-side static map figure for reports: the bundled offline basemap tiles (public/tiles-offline)
 * composited with sharp, station symbols from the phase-map scheme drawn as an SVG overlay (clustered with
 * the same supercluster summaries as the live map where symbols would overlap), a scale bar, a north
 * arrow and the basemap attribution. Returns a PNG.
 */
import { readFile } from "node:fs/promises";
import { join } from "node:path";
import sharp from "sharp";
import Supercluster from "supercluster";
import { hasOfflineTile, OFFLINE_DISTRICT_BBOX, OFFLINE_MAX_ZOOM, OFFLINE_TILE_ATTRIBUTION } from "@/lib/map/offline-tiles";
import { INK, PHASE_CLUSTER_OPTIONS, clusterSegments, clusterSymbolSvg, stationPointProps, stationSegments, stationSymbolSvg, type ClusterSummary, type PhaseMapStation, type StationPointProps } from "@/lib/phase-map";
import { framePixel, scaleBar, staticMapLayout, type StaticMapLayout } from "./static-map-layout";

export interface StaticMapOptions {
  /** @default 1000 */
  width?: number;
  /** @default 640 */
  height?: number;
  /** Draw candidates (outlined) as well as confirmed phases. @default true */
  candidates?: boolean;
  /** Only this mineral's symbol at each station. */
  mineral?: string | null;
  /** Folder with {z}/{x}/{y}.png. @default <cwd>/public/tiles-offline */
  tilesDir?: string;
}

const esc = (s: string) => s.replace(/[&<>"]/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;" })[c]!);

/** Strips the outer <svg …> wrapper so a symbol can be nested at a position. */
function placed(svg: string, size: number, x: number, y: number): string {
  return svg.replace(/^<svg [^>]*>/, `<svg x="${(x - size / 2).toFixed(1)}" y="${(y - size / 2).toFixed(1)}" width="${size}" height="${size}" viewBox="0 0 ${size} ${size}">`);
}

function overlaySvg(layout: StaticMapLayout, stations: readonly PhaseMapStation[], candidates: boolean, mineral: string | null): string {
  const parts: string[] = [];
  const index = new Supercluster<StationPointProps, ClusterSummary>({ radius: 28, maxZoom: 17, ...PHASE_CLUSTER_OPTIONS });
  index.load(stations.map((s) => ({ type: "Feature", geometry: { type: "Point", coordinates: [s.lon, s.lat] }, properties: stationPointProps(s, candidates) })));
  const byKey = new Map(stations.map((s) => [s.key, s]));
  for (const f of index.getClusters([-180, -85, 180, 85], layout.zoom)) {
    const [lon, lat] = f.geometry.coordinates;
    const { x, y } = framePixel(layout, lon, lat);
    if (x < -30 || y < -30 || x > layout.width + 30 || y > layout.height + 30) continue;
    const p = f.properties as Partial<ClusterSummary & StationPointProps & { cluster: boolean; point_count: number }>;
    if (p.cluster) {
      const d = clusterSymbolSvg(clusterSegments(p as ClusterSummary, { candidates }), p.point_count ?? 0);
      parts.push(placed(d.svg, d.size, x, y));
    } else {
      const s = byKey.get(p.key!);
      if (!s) continue;
      const d = stationSymbolSvg(stationSegments(s, { candidates, mineral }));
      parts.push(placed(d.svg, d.size, x, y));
    }
  }
  const bar = scaleBar(layout.metresPerPixel);
  const label = bar.metres >= 1000 ? `${bar.metres / 1000} km` : `${bar.metres} m`;
  const bx = 16;
  const by = layout.height - 40;
  parts.push(
    `<rect x="${bx - 6}" y="${by - 18}" width="${bar.px + 64}" height="30" fill="#FFFFFF" fill-opacity="0.85" rx="3"/>`,
    `<path d="M${bx},${by}h${bar.px.toFixed(1)}M${bx},${by - 5}v10M${(bx + bar.px).toFixed(1)},${by - 5}v10" stroke="${INK}" stroke-width="2" fill="none"/>`,
    `<text x="${(bx + bar.px + 8).toFixed(1)}" y="${by + 4}" font-family="DejaVu Sans,Helvetica,Arial,sans-serif" font-size="13" fill="${INK}">${label}</text>`,
    // North arrow (the frame is north-up in Web Mercator).
    `<g transform="translate(${layout.width - 34},18)"><rect x="-12" y="-6" width="24" height="44" fill="#FFFFFF" fill-opacity="0.85" rx="3"/><path d="M0,0 L8,22 L0,17 L-8,22 Z" fill="${INK}"/><text x="0" y="35" text-anchor="middle" font-family="DejaVu Sans,Helvetica,Arial,sans-serif" font-size="11" font-weight="700" fill="${INK}">N</text></g>`,
    `<rect x="0" y="${layout.height - 16}" width="${layout.width}" height="16" fill="#FFFFFF" fill-opacity="0.8"/>`,
    `<text x="${layout.width - 6}" y="${layout.height - 4}" text-anchor="end" font-family="DejaVu Sans,Helvetica,Arial,sans-serif" font-size="10" fill="${INK}">${esc(OFFLINE_TILE_ATTRIBUTION)}</text>`,
  );
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${layout.width}" height="${layout.height}" viewBox="0 0 ${layout.width} ${layout.height}">${parts.join("")}</svg>`;
}

/** Renders the map of `stations` as a PNG (and the layout used). */
export async function renderStaticMap(stations: readonly PhaseMapStation[], options: StaticMapOptions = {}): Promise<{ png: Buffer; layout: StaticMapLayout }> {
  const { width = 1000, height = 640, candidates = true, mineral = null, tilesDir = join(/* turbopackIgnore: true */ process.cwd(), "public", "tiles-offline") } = options;
  const d = OFFLINE_DISTRICT_BBOX;
  const layout = staticMapLayout(stations, { width, height, maxZoom: OFFLINE_MAX_ZOOM, fallbackCenter: { lon: (d.west + d.east) / 2, lat: (d.south + d.north) / 2 }, minZoom: stations.length ? 0 : 11 });
  // Canvas covering whole tiles (sharp composites at non-negative offsets), cropped to the frame afterwards.
  const minLeft = Math.min(0, ...layout.tiles.map((t) => t.left));
  const minTop = Math.min(0, ...layout.tiles.map((t) => t.top));
  const canvasW = Math.max(width - minLeft, ...layout.tiles.map((t) => t.left - minLeft + 256));
  const canvasH = Math.max(height - minTop, ...layout.tiles.map((t) => t.top - minTop + 256));
  const tiles = await Promise.all(
    layout.tiles.map(async (t) => {
      if (!hasOfflineTile(t.z, t.x, t.y)) return null;
      try {
        return { input: await readFile(join(/* turbopackIgnore: true */ tilesDir, String(t.z), String(t.x), `${t.y}.png`)), left: t.left - minLeft, top: t.top - minTop };
      } catch {
        return null;
      }
    }),
  );
  const base = await sharp({ create: { width: canvasW, height: canvasH, channels: 3, background: "#E8EDEF" } })
    .composite(tiles.filter((t): t is NonNullable<typeof t> => t !== null))
    .png()
    .toBuffer();
  const png = await sharp(base)
    .extract({ left: -minLeft, top: -minTop, width, height })
    .composite([{ input: Buffer.from(overlaySvg(layout, stations, candidates, mineral)), left: 0, top: 0 }])
    .png()
    .toBuffer();
  return { png, layout };
}

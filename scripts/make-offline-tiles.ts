/**
 * Generates Lithodex's offline basemap: 256-px palette PNG tiles in XYZ addressing
 * (`public/tiles-offline/{z}/{x}/{y}.png`, y = 0 at the north edge) for the coverage declared in
 * `lib/map/offline-tiles.ts` (world z0–5, Iberia z6–9, the district's surroundings z10–12, the demo
 * district z13–15). The map then needs no network at all.
 *
 * Sources and licences
 * - Natural Earth 1:110m / 1:50m / 1:10m land and admin-0 countries, v4.1.0, public domain, as
 *   TopoJSON from the npm package `world-atlas` (read with `topojson-client`).
 * - Rivers: WDBII river lines inside GSHHG 2.3.7 (Wessel & Smith), LGPL-3+, from Debian's packages
 *   `gmt-gshhg-low` and `gmt-gshhg-full`, extracted with GMT (`gmt coast -I… -M`, Debian `gmt`).
 * - UTM zone 29N (EPSG:32629, WGS84) 1 km grid computed with `proj4`; rendering with `sharp` (SVG → PNG).
 *
 * How to rerun (once, by hand; the output is committed and CI does not regenerate it):
 *   apt-get install -y gmt gmt-gshhg-low gmt-gshhg-full   # Debian 12, for the river lines
 *   npx tsx scripts/make-offline-tiles.ts
 * The run deletes and rewrites the zoom folders and README.md under `public/tiles-offline/`.
 * Same inputs give the same tiles.
 */
import { execFileSync } from "node:child_process";
import { mkdirSync, readFileSync, rmSync, statSync, writeFileSync, readdirSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import proj4 from "proj4";
import sharp from "sharp";
import { feature, mesh } from "topojson-client";
import type { GeometryCollection, Topology } from "topojson-specification";

import {
  OFFLINE_TILE_ATTRIBUTION,
  OFFLINE_TILE_COVERAGE,
  OFFLINE_TILE_SIZE,
  offlineTileRanges,
} from "../lib/map/offline-tiles";
import { lonLatToWorldPixel, type LonLatBBox } from "../lib/map/tiles";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const OUT_DIR = path.join(ROOT, "public", "tiles-offline");
const T = OFFLINE_TILE_SIZE;
/** Clip margin around each tile, px: clip-edge artefacts stay outside the visible square. */
const MARGIN = 6;
/** Labels whose anchor lies this far outside a tile are still drawn, so text crossing an edge matches. */
const LABEL_MARGIN = 80;
const CONCURRENCY = 4;

/** Our palette: calm paper land, grey-blue sea, plum borders, rust UTM grid. */
const STYLE = {
  sea: "#cadbe3",
  land: "#f2efe6",
  coast: "#86a7b6",
  border: "#8e7397",
  river: "#6d9fbb",
  graticule: "#7f93a3",
  grid: "#b0613f",
  gridText: "#7d3a22",
  gratText: "#4f6675",
  font: "DejaVu Sans Condensed, DejaVu Sans, sans-serif",
} as const;

const UTM29N = "+proj=utm +zone=29 +datum=WGS84 +units=m +no_defs";
const toUtm = proj4("EPSG:4326", UTM29N);

// ---------------------------------------------------------------------------------------------
// Source data, in lon/lat

/** A polyline or ring as interleaved lon,lat (or x,y) pairs. */
type Coords = Float64Array;

interface LineSet {
  lines: Coords[];
  /** Per line: minX, minY, maxX, maxY. */
  boxes: Float64Array;
}

function makeLineSet(lines: Coords[]): LineSet {
  const boxes = new Float64Array(lines.length * 4);
  lines.forEach((c, i) => {
    let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity;
    for (let k = 0; k < c.length; k += 2) {
      const x = c[k], y = c[k + 1];
      if (x < x0) x0 = x;
      if (x > x1) x1 = x;
      if (y < y0) y0 = y;
      if (y > y1) y1 = y;
    }
    boxes.set([x0, y0, x1, y1], i * 4);
  });
  return { lines, boxes };
}

function toCoords(points: number[][]): Coords {
  const c = new Float64Array(points.length * 2);
  points.forEach(([lon, lat], i) => {
    c[2 * i] = lon;
    c[2 * i + 1] = lat;
  });
  return c;
}

interface NaturalEarth {
  /** Land rings (outer and holes, opposite winding), filled non-zero. */
  land: LineSet;
  /** Coastlines: land rings without the artificial edges along ±180° and the Mercator cut. */
  coast: LineSet;
  /** Land borders between countries. */
  borders: LineSet;
}

function readTopology(file: string): Topology {
  const full = path.join(ROOT, "node_modules", "world-atlas", file);
  return JSON.parse(readFileSync(full, "utf8")) as Topology;
}

/**
 * Makes a line or ring continuous across the antimeridian (longitudes may leave −180 … 180) and
 * returns it with the copies shifted by ±360° needed to cover the visible world. A ring that goes
 * once around a pole (Antarctica) is closed along that pole.
 */
function unwrapAcrossAntimeridian(points: number[][], ring: boolean): number[][][] {
  if (points.length === 0) return [];
  const out: number[][] = [[points[0][0], points[0][1]]];
  let shift = 0;
  let west = points[0][0], east = points[0][0];
  for (let i = 1; i < points.length; i++) {
    const d = points[i][0] - points[i - 1][0];
    if (d > 180) shift -= 360;
    else if (d < -180) shift += 360;
    const lon = points[i][0] + shift;
    out.push([lon, points[i][1]]);
    west = Math.min(west, lon);
    east = Math.max(east, lon);
  }
  if (ring && shift !== 0) {
    const poleLat = out.reduce((a, p) => a + p[1], 0) < 0 ? -90 : 90;
    out.push([out[out.length - 1][0], poleLat], [out[0][0], poleLat]);
  }
  const copies = [out];
  if (west < -180) copies.push(out.map(([lon, lat]) => [lon + 360, lat]));
  if (east > 180) copies.push(out.map(([lon, lat]) => [lon - 360, lat]));
  return copies;
}

/** Splits a ring where it runs along the antimeridian or the southern cut of the data set. */
function coastPieces(ring: number[][]): number[][][] {
  const artificial = (a: number[], b: number[]) =>
    (Math.abs(a[0]) > 179.999 && Math.abs(b[0]) > 179.999) || (a[1] < -84.9 && b[1] < -84.9);
  const pieces: number[][][] = [];
  let cur: number[][] = [ring[0]];
  for (let i = 1; i < ring.length; i++) {
    if (artificial(ring[i - 1], ring[i])) {
      if (cur.length > 1) pieces.push(cur);
      cur = [ring[i]];
    } else cur.push(ring[i]);
  }
  if (cur.length > 1) pieces.push(cur);
  return pieces;
}

function loadNaturalEarth(scale: "110m" | "50m" | "10m"): NaturalEarth {
  const landTopo = readTopology(`land-${scale}.json`);
  const landFc = feature(landTopo, landTopo.objects.land as GeometryCollection);
  const rings: number[][][] = [];
  for (const f of landFc.features) {
    const g = f.geometry;
    if (g.type === "Polygon") rings.push(...g.coordinates);
    else if (g.type === "MultiPolygon") for (const p of g.coordinates) rings.push(...p);
  }
  const countriesTopo = readTopology(`countries-${scale}.json`);
  const borderMesh = mesh(countriesTopo, countriesTopo.objects.countries as GeometryCollection, (a, b) => a !== b);
  // The data stop near 85.2° S; everything south of 84.5° S is Antarctic land, so snap it to the pole
  // and the land reaches the bottom of the Mercator square.
  const landRings = rings.map((r) => r.map(([lon, lat]) => [lon, lat < -84.5 ? -90 : lat]));
  return {
    land: makeLineSet(landRings.flatMap((r) => unwrapAcrossAntimeridian(r, true)).map(toCoords)),
    coast: makeLineSet(
      rings
        .flatMap(coastPieces)
        .flatMap((l) => unwrapAcrossAntimeridian(l, false))
        .map(toCoords),
    ),
    borders: makeLineSet(borderMesh.coordinates.flatMap((l) => unwrapAcrossAntimeridian(l, false)).map(toCoords)),
  };
}

interface RiverSet {
  set: LineSet;
  /** WDBII level of each line: 1 double-lined, 2 permanent major, 3 additional major, 4 additional. */
  levels: Uint8Array;
}

/** River lines from GSHHG through GMT, for one region and resolution, levels 1…maxLevel. */
function loadRivers(resolution: "l" | "f", bbox: LonLatBBox, maxLevel: number): RiverSet {
  const region = `-R${bbox.west}/${bbox.east}/${bbox.south}/${bbox.north}`;
  let text: string;
  try {
    text = execFileSync("gmt", ["coast", region, `-D${resolution}`, "-Ir", "-M"], {
      encoding: "utf8",
      maxBuffer: 512 * 1024 * 1024,
      stdio: ["ignore", "pipe", "pipe"],
    });
  } catch (err) {
    throw new Error(
      `GMT could not extract GSHHG rivers (${(err as Error).message.split("\n")[0]}). ` +
        "Install them with: apt-get install -y gmt gmt-gshhg-low gmt-gshhg-full",
    );
  }
  const lines: Coords[] = [];
  const levels: number[] = [];
  let level = 0;
  let pts: number[][] = [];
  const flush = () => {
    if (pts.length > 1 && level >= 1 && level <= maxLevel) {
      for (const copy of unwrapAcrossAntimeridian(pts, false)) {
        lines.push(toCoords(copy));
        levels.push(level);
      }
    }
    pts = [];
  };
  text.split("\n").forEach((line, i) => {
    if (line.startsWith(">")) {
      flush();
      const m = /Level\s+(\d+)/.exec(line);
      if (!m) throw new Error(`gmt coast output line ${i + 1}: segment header without a level: "${line}"`);
      level = Number(m[1]);
    } else if (line.trim() !== "") {
      const [lon, lat] = line.trim().split(/\s+/).map(Number);
      if (!Number.isFinite(lon) || !Number.isFinite(lat)) {
        throw new Error(`gmt coast output line ${i + 1}: expected "lon lat", got "${line}"`);
      }
      pts.push([lon > 180 ? lon - 360 : lon, lat]);
    }
  });
  flush();
  return { set: makeLineSet(lines), levels: Uint8Array.from(levels) };
}

// ---------------------------------------------------------------------------------------------
// Projection and clipping, in world pixels of one zoom level

/** World pixel of a position whose longitude may lie outside −180 … 180 (unwrapped lines). */
function worldPixel(lon: number, lat: number, z: number): { px: number; py: number } {
  const turns = Math.floor((lon + 180) / 360);
  const p = lonLatToWorldPixel(lon - 360 * turns, Math.max(-90, Math.min(90, lat)), z, T);
  return { px: p.px + turns * T * 2 ** z, py: p.py };
}

/** Projects lon/lat lines to world pixels at zoom z, dropping vertices closer than `minStep` px. */
function projectSet(
  src: LineSet,
  z: number,
  keep: (i: number) => boolean,
  closed: boolean,
  minStep = 0.3,
): { set: LineSet; kept: number[] } {
  const out: Coords[] = [];
  const kept: number[] = [];
  for (let i = 0; i < src.lines.length; i++) {
    if (!keep(i)) continue;
    const c = src.lines[i];
    const buf = new Float64Array(c.length);
    let n = 0;
    let lx = NaN, ly = NaN;
    for (let k = 0; k < c.length; k += 2) {
      const { px, py } = worldPixel(c[k], c[k + 1], z);
      const last = k === c.length - 2;
      if (n > 0 && !last && Math.abs(px - lx) < minStep && Math.abs(py - ly) < minStep) continue;
      buf[n++] = px;
      buf[n++] = py;
      lx = px;
      ly = py;
    }
    if (n >= (closed ? 6 : 4)) {
      out.push(buf.slice(0, n));
      kept.push(i);
    }
  }
  return { set: makeLineSet(out), kept };
}

/** Lon/lat box to keep when preparing a zoom level: the coverage plus a little slack. */
function inBox(src: LineSet, box: LonLatBBox, slack: number): (i: number) => boolean {
  return (i) => {
    const b = src.boxes;
    return !(
      b[i * 4] > box.east + slack ||
      b[i * 4 + 2] < box.west - slack ||
      b[i * 4 + 1] > box.north + slack ||
      b[i * 4 + 3] < box.south - slack
    );
  };
}

/** Sutherland–Hodgman clip of a closed ring (local px) to the square [lo, hi]². */
function clipRing(ring: Coords, lo: number, hi: number): Coords {
  let input = Array.from(ring);
  const edges: Array<[number, number, boolean]> = [
    [0, lo, true], // x >= lo
    [0, hi, false], // x <= hi
    [1, lo, true],
    [1, hi, false],
  ];
  for (const [axis, v, keepAbove] of edges) {
    const n = input.length / 2;
    if (n === 0) break;
    const output: number[] = [];
    const inside = (k: number) => (keepAbove ? input[2 * k + axis] >= v : input[2 * k + axis] <= v);
    for (let k = 0; k < n; k++) {
      const j = (k + n - 1) % n;
      const ci = inside(k), pi = inside(j);
      if (ci !== pi) {
        const a = input[2 * j + axis], b = input[2 * k + axis];
        const t = (v - a) / (b - a);
        const x = input[2 * j] + t * (input[2 * k] - input[2 * j]);
        const y = input[2 * j + 1] + t * (input[2 * k + 1] - input[2 * j + 1]);
        output.push(x, y);
      }
      if (ci) output.push(input[2 * k], input[2 * k + 1]);
    }
    input = output;
  }
  return Float64Array.from(input);
}

/** Liang–Barsky clip of a polyline (local px) to the square [lo, hi]²; returns the visible pieces. */
function clipLine(line: Coords, lo: number, hi: number): number[][] {
  const pieces: number[][] = [];
  let cur: number[] | null = null;
  for (let k = 2; k < line.length; k += 2) {
    const x0 = line[k - 2], y0 = line[k - 1], x1 = line[k], y1 = line[k + 1];
    const dx = x1 - x0, dy = y1 - y0;
    let t0 = 0, t1 = 1;
    let visible = true;
    for (const [p, q] of [
      [-dx, x0 - lo],
      [dx, hi - x0],
      [-dy, y0 - lo],
      [dy, hi - y0],
    ]) {
      if (p === 0) {
        if (q < 0) visible = false;
      } else {
        const r = q / p;
        if (p < 0) t0 = Math.max(t0, r);
        else t1 = Math.min(t1, r);
      }
    }
    if (!visible || t0 > t1) {
      cur = null;
      continue;
    }
    const ax = x0 + t0 * dx, ay = y0 + t0 * dy, bx = x0 + t1 * dx, by = y0 + t1 * dy;
    if (cur && t0 === 0) cur.push(bx, by);
    else {
      cur = [ax, ay, bx, by];
      pieces.push(cur);
    }
    if (t1 < 1) cur = null;
  }
  return pieces;
}

const f1 = (v: number) => (Math.round(v * 10) / 10).toString();

function pathData(pieces: ArrayLike<number>[], close: boolean): string {
  let d = "";
  for (const p of pieces) {
    if (p.length < 4) continue;
    d += `M${f1(p[0])} ${f1(p[1])}`;
    for (let k = 2; k < p.length; k += 2) d += `L${f1(p[k])} ${f1(p[k + 1])}`;
    if (close) d += "Z";
  }
  return d;
}

/** Lines of a set that touch the tile whose world-pixel origin is (ox, oy), clipped, in local px. */
function tilePieces(set: LineSet, ox: number, oy: number, pick?: (i: number) => boolean): number[][] {
  const lo = -MARGIN, hi = T + MARGIN;
  const out: number[][] = [];
  const b = set.boxes;
  for (let i = 0; i < set.lines.length; i++) {
    if (b[i * 4] - ox > hi || b[i * 4 + 2] - ox < lo || b[i * 4 + 1] - oy > hi || b[i * 4 + 3] - oy < lo) continue;
    if (pick && !pick(i)) continue;
    const c = set.lines[i];
    const local = new Float64Array(c.length);
    for (let k = 0; k < c.length; k += 2) {
      local[k] = c[k] - ox;
      local[k + 1] = c[k + 1] - oy;
    }
    out.push(...clipLine(local, lo, hi));
  }
  return out;
}

function tileRings(set: LineSet, ox: number, oy: number): Coords[] {
  const lo = -MARGIN, hi = T + MARGIN;
  const out: Coords[] = [];
  const b = set.boxes;
  for (let i = 0; i < set.lines.length; i++) {
    if (b[i * 4] - ox > hi || b[i * 4 + 2] - ox < lo || b[i * 4 + 1] - oy > hi || b[i * 4 + 3] - oy < lo) continue;
    const c = set.lines[i];
    const local = new Float64Array(c.length);
    for (let k = 0; k < c.length; k += 2) {
      local[k] = c[k] - ox;
      local[k + 1] = c[k + 1] - oy;
    }
    const clipped = clipRing(local, lo, hi);
    if (clipped.length >= 6) out.push(clipped);
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// Graticule and UTM grid

/** Graticule spacing in degrees for each zoom. */
function graticuleStep(z: number): number {
  const steps = [30, 30, 15, 10, 5, 5, 2, 1, 1, 0.5, 0.25, 0.1, 0.1, 0.05, 0.05, 0.05];
  return steps[Math.min(z, steps.length - 1)];
}

interface Label {
  x: number;
  y: number;
  text: string;
  anchor: "start" | "end";
}

/** Graticule lines (local px) for a tile, sampled at absolute positions so neighbours agree. */
function graticule(z: number, ox: number, oy: number): { pieces: number[][]; labels: Label[] } {
  const step = graticuleStep(z);
  const pieces: number[][] = [];
  const labels: Label[] = [];
  const lo = -MARGIN, hi = T + MARGIN;
  const size = T * 2 ** z;
  const lonOf = (px: number) => (px / size) * 360 - 180;
  const latOf = (py: number) => (Math.atan(Math.sinh(Math.PI * (1 - (2 * py) / size))) * 180) / Math.PI;
  const west = lonOf(Math.max(0, ox - LABEL_MARGIN)), east = lonOf(Math.min(size, ox + T + LABEL_MARGIN));
  const north = latOf(Math.max(0, oy - LABEL_MARGIN)), south = latOf(Math.min(size, oy + T + LABEL_MARGIN));
  const eps = 1e-9;
  const lons: number[] = [];
  for (let k = Math.ceil(west / step - eps); k * step <= east + eps; k++) lons.push(k * step);
  const lats: number[] = [];
  for (let k = Math.ceil(south / step - eps); k * step <= north + eps; k++) {
    if (Math.abs(k * step) < 85.06) lats.push(k * step);
  }
  // Meridians are vertical and parallels horizontal in Web Mercator: straight lines suffice.
  for (const lon of lons) {
    const x = lonLatToWorldPixel(Math.max(-180, Math.min(180, lon)), 0, z, T).px - ox;
    if (x >= lo && x <= hi) pieces.push([x, lo, x, hi]);
  }
  for (const lat of lats) {
    const y = lonLatToWorldPixel(0, lat, z, T).py - oy;
    if (y >= lo && y <= hi) pieces.push([lo, y, hi, y]);
  }
  // Graticule labels where there is no UTM grid: a small tag at each labelled crossing.
  if (z >= 3 && z <= 11) {
    const decimals = step >= 1 ? 0 : step >= 0.1 ? 1 : 2;
    const fmt = (v: number, pos: string, neg: string) =>
      `${Math.abs(v).toFixed(decimals)}°${Math.abs(v) === 180 || v === 0 ? "" : v > 0 ? pos : neg}`;
    for (const lon of lons) {
      for (const lat of lats) {
        const li = Math.round(lon / step), la = Math.round(lat / step);
        if ((li + la) % 2 !== 0) continue; // every other crossing, chequered
        const p = lonLatToWorldPixel(Math.max(-180, Math.min(180, lon)), lat, z, T);
        labels.push({ x: p.px - ox + 3, y: p.py - oy - 3, text: fmt(lat, "N", "S"), anchor: "start" });
        labels.push({ x: p.px - ox + 3, y: p.py - oy + 9, text: fmt(lon, "E", "W"), anchor: "start" });
      }
    }
  }
  return { pieces, labels };
}

/** Every 5th kilometre line of the UTM grid is drawn stronger. */
const MAJOR_KM = 5;

/** UTM 29N 1 km grid lines (minor, and major every 5 km) and labels (local px) for a tile at z ≥ 12. */
function utmGrid(z: number, ox: number, oy: number): { minor: number[][]; major: number[][]; labels: Label[] } {
  const size = T * 2 ** z;
  const lonOf = (px: number) => (px / size) * 360 - 180;
  const latOf = (py: number) => (Math.atan(Math.sinh(Math.PI * (1 - (2 * py) / size))) * 180) / Math.PI;
  const m = LABEL_MARGIN;
  // Tile (plus label margin) extent in UTM, from its corners and edge midpoints.
  let e0 = Infinity, e1 = -Infinity, n0 = Infinity, n1 = -Infinity;
  for (const fx of [0, 0.5, 1]) {
    for (const fy of [0, 0.5, 1]) {
      const [e, n] = toUtm.forward([lonOf(ox - m + fx * (T + 2 * m)), latOf(oy - m + fy * (T + 2 * m))]);
      e0 = Math.min(e0, e);
      e1 = Math.max(e1, e);
      n0 = Math.min(n0, n);
      n1 = Math.max(n1, n);
    }
  }
  const km = 1000;
  const sample = 250; // m; absolute sample positions, shared by neighbouring tiles
  const eStart = Math.floor(e0 / km) * km, eEnd = Math.ceil(e1 / km) * km;
  const nStart = Math.floor(n0 / km) * km, nEnd = Math.ceil(n1 / km) * km;
  const toLocal = (e: number, n: number): [number, number] => {
    const [lon, lat] = toUtm.inverse([e, n]);
    const p = lonLatToWorldPixel(lon, lat, z, T);
    return [p.px - ox, p.py - oy];
  };
  const lines: Coords[] = [];
  const isMajor: boolean[] = [];
  for (let e = eStart; e <= eEnd; e += km) {
    const pts: number[] = [];
    for (let n = nStart; n <= nEnd; n += sample) pts.push(...toLocal(e, n));
    lines.push(Float64Array.from(pts));
    isMajor.push((e / km) % MAJOR_KM === 0);
  }
  for (let n = nStart; n <= nEnd; n += km) {
    const pts: number[] = [];
    for (let e = eStart; e <= eEnd; e += sample) pts.push(...toLocal(e, n));
    lines.push(Float64Array.from(pts));
    isMajor.push((n / km) % MAJOR_KM === 0);
  }
  const pieces = lines.map((l) => clipLine(l, -MARGIN, T + MARGIN));
  const labelKm = z >= 14 ? 1 : MAJOR_KM;
  const labels: Label[] = [];
  for (let e = eStart; e <= eEnd; e += km) {
    if ((e / km) % labelKm !== 0) continue;
    for (let n = nStart; n <= nEnd; n += km) {
      if ((n / km) % labelKm !== 0) continue;
      const [x, y] = toLocal(e, n);
      if (x < -m || x > T + m || y < -m || y > T + m) continue;
      labels.push({ x: x + 3, y: y - 3, text: `${e / km} E`, anchor: "start" });
      labels.push({ x: x + 3, y: y + 9, text: `${n / km} N`, anchor: "start" });
    }
  }
  return {
    minor: pieces.filter((_, i) => !isMajor[i]).flat(),
    major: pieces.filter((_, i) => isMajor[i]).flat(),
    labels,
  };
}

function labelSvg(labels: Label[], fill: string, halo: string, fontSize: number): string {
  if (labels.length === 0) return "";
  const texts = labels
    .map((l) => `<text x="${f1(l.x)}" y="${f1(l.y)}" text-anchor="${l.anchor}">${l.text}</text>`)
    .join("");
  return (
    `<g font-family="${STYLE.font}" font-size="${fontSize}" stroke="${halo}" stroke-width="2.4" ` +
    `stroke-linejoin="round" fill="none">${texts}</g>` +
    `<g font-family="${STYLE.font}" font-size="${fontSize}" fill="${fill}">${texts}</g>`
  );
}

// ---------------------------------------------------------------------------------------------
// Per-zoom layers and tile rendering

interface ZoomLayers {
  z: number;
  land: LineSet;
  coast: LineSet;
  borders: LineSet;
  rivers: LineSet;
  riverLevels: Uint8Array;
}

function blockFor(z: number) {
  const block = OFFLINE_TILE_COVERAGE.find((b) => z >= b.minZoom && z <= b.maxZoom);
  if (!block) throw new Error(`no coverage block for zoom ${z}`);
  return block;
}

function prepareZoom(
  z: number,
  ne: Record<"110m" | "50m" | "10m", NaturalEarth>,
  riversLow: RiverSet,
  riversFull: RiverSet,
): ZoomLayers {
  const block = blockFor(z);
  const src = z <= 2 ? ne["110m"] : z <= 4 ? ne["50m"] : ne["10m"];
  const slack = block.name === "world" ? 0 : 1;
  const box = block.bbox;
  const all = () => true;
  const keep = block.name === "world" ? () => all : (s: LineSet) => inBox(s, box, slack);
  const land = projectSet(src.land, z, keep(src.land), true).set;
  const coast = projectSet(src.coast, z, keep(src.coast), false).set;
  const borders = projectSet(src.borders, z, keep(src.borders), false).set;
  // Rivers: major WDBII rivers on the world zooms from z3, all permanent rivers nearer the district.
  let rivers = makeLineSet([]);
  let riverLevels = new Uint8Array(0);
  if (z >= 3) {
    const r = z <= 5 ? riversLow : riversFull;
    const maxLevel = z <= 4 ? 1 : z <= 7 ? 2 : z <= 9 ? 3 : 4;
    const inside = block.name === "world" ? all : inBox(r.set, box, slack);
    const projected = projectSet(r.set, z, (i) => r.levels[i] <= maxLevel && inside(i), false);
    rivers = projected.set;
    riverLevels = Uint8Array.from(projected.kept.map((i) => r.levels[i]));
  }
  return { z, land, coast, borders, rivers, riverLevels };
}

function riverWidth(z: number, level: number): number {
  const base = z <= 5 ? 0.7 : z <= 9 ? 0.9 : z <= 12 ? 1.2 : 1.6;
  return level <= 2 ? base * 1.4 : level === 3 ? base * 1.15 : base;
}

function tileSvg(L: ZoomLayers, x: number, y: number): string {
  const z = L.z;
  const ox = x * T, oy = y * T;
  const parts: string[] = [];
  parts.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${T}" height="${T}" viewBox="0 0 ${T} ${T}">`);
  parts.push(`<rect width="${T}" height="${T}" fill="${STYLE.sea}"/>`);
  const land = pathData(Array.from(tileRings(L.land, ox, oy)), true);
  if (land) parts.push(`<path d="${land}" fill="${STYLE.land}" fill-rule="nonzero"/>`);
  const grat = graticule(z, ox, oy);
  const gratOpacity = z >= 12 ? 0.35 : 0.45;
  if (grat.pieces.length) {
    parts.push(
      `<path d="${pathData(grat.pieces, false)}" fill="none" stroke="${STYLE.graticule}" ` +
        `stroke-width="0.6" stroke-opacity="${gratOpacity}"/>`,
    );
  }
  const coast = pathData(tilePieces(L.coast, ox, oy), false);
  const coastWidth = z <= 2 ? 0.6 : z <= 8 ? 0.8 : 1.1;
  if (coast) {
    parts.push(
      `<path d="${coast}" fill="none" stroke="${STYLE.coast}" stroke-width="${coastWidth}" stroke-linejoin="round"/>`,
    );
  }
  // Rivers grouped by stroke width.
  const widths = new Map<number, number[][]>();
  const b = L.rivers.boxes;
  const lo = -MARGIN, hi = T + MARGIN;
  for (let i = 0; i < L.rivers.lines.length; i++) {
    if (b[i * 4] - ox > hi || b[i * 4 + 2] - ox < lo || b[i * 4 + 1] - oy > hi || b[i * 4 + 3] - oy < lo) continue;
    const w = riverWidth(z, L.riverLevels[i]);
    const pieces = tilePieces(makeLineSet([L.rivers.lines[i]]), ox, oy);
    if (!widths.has(w)) widths.set(w, []);
    widths.get(w)!.push(...pieces);
  }
  for (const [w, pieces] of [...widths.entries()].sort((a, c) => a[0] - c[0])) {
    parts.push(
      `<path d="${pathData(pieces, false)}" fill="none" stroke="${STYLE.river}" stroke-width="${w}" ` +
        `stroke-linecap="round" stroke-linejoin="round"/>`,
    );
  }
  const borders = pathData(tilePieces(L.borders, ox, oy), false);
  if (borders) {
    const bw = z <= 3 ? 0.7 : z <= 7 ? 1 : 1.4;
    parts.push(
      `<path d="${borders}" fill="none" stroke="${STYLE.land}" stroke-width="${bw + 1.6}" stroke-linejoin="round"/>` +
        `<path d="${borders}" fill="none" stroke="${STYLE.border}" stroke-width="${bw}" stroke-linejoin="round"/>`,
    );
  }
  let labels = "";
  if (z >= 12) {
    const grid = utmGrid(z, ox, oy);
    const minorOpacity = z === 12 ? 0.35 : z === 13 ? 0.5 : 0.7;
    if (grid.minor.length) {
      parts.push(
        `<path d="${pathData(grid.minor, false)}" fill="none" stroke="${STYLE.grid}" stroke-width="${z >= 14 ? 0.8 : 0.6}" ` +
          `stroke-opacity="${minorOpacity}"/>`,
      );
    }
    if (grid.major.length) {
      parts.push(
        `<path d="${pathData(grid.major, false)}" fill="none" stroke="${STYLE.grid}" stroke-width="${z >= 14 ? 1.4 : 1.1}" ` +
          `stroke-opacity="0.85"/>`,
      );
    }
    labels = labelSvg(grid.labels, STYLE.gridText, STYLE.land, z >= 14 ? 10 : 9);
  } else {
    labels = labelSvg(grat.labels, STYLE.gratText, STYLE.land, 9);
  }
  parts.push(labels);
  parts.push("</svg>");
  return parts.join("");
}

async function renderTile(svg: string): Promise<Buffer> {
  return sharp(Buffer.from(svg), { density: 72 })
    .png({ palette: true, colours: 64, dither: 0, compressionLevel: 9, effort: 8 })
    .toBuffer();
}

async function pool<T>(items: T[], limit: number, fn: (item: T) => Promise<void>): Promise<void> {
  let next = 0;
  const workers = Array.from({ length: limit }, async () => {
    while (next < items.length) {
      const item = items[next++];
      await fn(item);
    }
  });
  await Promise.all(workers);
}

function folderReadme(stats: Map<number, { files: number; bytes: number }>, seconds: number): string {
  const rows = [...stats.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([z, s]) => {
      const block = blockFor(z);
      return `| ${z} | ${block.name} | ${s.files} | ${(s.bytes / 1024).toFixed(0)} |`;
    })
    .join("\n");
  const files = [...stats.values()].reduce((a, s) => a + s.files, 0);
  const bytes = [...stats.values()].reduce((a, s) => a + s.bytes, 0);
  const blocks = OFFLINE_TILE_COVERAGE.map(
    (b) =>
      `- ${b.name}: z${b.minZoom}–z${b.maxZoom}, lon ${b.bbox.west.toFixed(2)} … ${b.bbox.east.toFixed(2)}, ` +
      `lat ${b.bbox.south.toFixed(2)} … ${b.bbox.north.toFixed(2)}`,
  ).join("\n");
  return `# Offline basemap tiles

Generated by \`npx tsx scripts/make-offline-tiles.ts\` (do not edit by hand). 256-px palette PNG,
XYZ addressing \`{z}/{x}/{y}.png\` (y = 0 at the north edge; TMS/MBTiles rows are 2^z − 1 − y).
Coverage (every tile intersecting each box, see \`lib/map/offline-tiles.ts\`):

${blocks}

Attribution: ${OFFLINE_TILE_ATTRIBUTION}.

- Land, coastlines and country borders: Natural Earth v4.1.0 (1:110m at z0–2, 1:50m at z3–4, 1:10m from z5),
  public domain, via the npm package world-atlas.
- Rivers (z3 and up): WDBII river lines of GSHHG 2.3.7 (P. Wessel and W. H. F. Smith), GNU LGPL v3 or later,
  via Debian's gmt-gshhg packages and GMT. No lakes, roads, towns or relief are drawn.
- Graticule in degrees (labelled z3–z11). From z12: UTM zone 29N (EPSG:32629, WGS84) grid every 1 km,
  labelled in km (easting E, northing N) on the stronger 5 km lines at z12–z13 and every 1 km at z14–z15.
  Outside zone 29 (west of 12° W or east of 6° W) the grid is zone 29's extended, not the local zone.

| zoom | block | files | KiB |
|---|---|---|---|
${rows}

Total: ${files} files, ${(bytes / 1024 / 1024).toFixed(1)} MiB; generated in ${seconds.toFixed(0)} s on 2 cores.
`;
}

async function main(): Promise<void> {
  const started = Date.now();
  const ne = { "110m": loadNaturalEarth("110m"), "50m": loadNaturalEarth("50m"), "10m": loadNaturalEarth("10m") };
  const world: LonLatBBox = { west: -180, south: -90, east: 180, north: 90 };
  const iberia = OFFLINE_TILE_COVERAGE.find((b) => b.name === "iberia")!.bbox;
  const riverBox: LonLatBBox = {
    west: iberia.west - 1,
    south: iberia.south - 1,
    east: iberia.east + 1,
    north: iberia.north + 1,
  };
  const riversLow = loadRivers("l", world, 2);
  const riversFull = loadRivers("f", riverBox, 4);
  console.log(
    `sources: NE land 10m ${ne["10m"].land.lines.length} rings; rivers low ${riversLow.set.lines.length}, ` +
      `full ${riversFull.set.lines.length} lines (${((Date.now() - started) / 1000).toFixed(1)} s)`,
  );

  // `--zooms=12,15` re-renders only those levels (for trying styles); a full run rewrites everything.
  const only = process.argv.find((a) => a.startsWith("--zooms="));
  const zooms = only ? new Set(only.slice(8).split(",").map(Number)) : null;
  for (const entry of readdirSync(OUT_DIR, { withFileTypes: true })) {
    if (!entry.isDirectory() || !/^\d+$/.test(entry.name)) continue;
    if (!zooms || zooms.has(Number(entry.name))) rmSync(path.join(OUT_DIR, entry.name), { recursive: true });
  }

  const stats = new Map<number, { files: number; bytes: number }>();
  for (const range of offlineTileRanges()) {
    if (zooms && !zooms.has(range.z)) continue;
    const t0 = Date.now();
    const layers = prepareZoom(range.z, ne, riversLow, riversFull);
    const jobs: Array<{ x: number; y: number }> = [];
    for (let x = range.xMin; x <= range.xMax; x++) {
      mkdirSync(path.join(OUT_DIR, String(range.z), String(x)), { recursive: true });
      for (let y = range.yMin; y <= range.yMax; y++) jobs.push({ x, y });
    }
    const s = { files: 0, bytes: 0 };
    await pool(jobs, CONCURRENCY, async ({ x, y }) => {
      const png = await renderTile(tileSvg(layers, x, y));
      const file = path.join(OUT_DIR, String(range.z), String(x), `${y}.png`);
      writeFileSync(file, png);
      s.files++;
      s.bytes += statSync(file).size;
    });
    stats.set(range.z, s);
    console.log(
      `z${range.z}: ${s.files} tiles, ${(s.bytes / 1024).toFixed(0)} KiB, ${((Date.now() - t0) / 1000).toFixed(1)} s`,
    );
  }
  const seconds = (Date.now() - started) / 1000;
  if (!zooms) writeFileSync(path.join(OUT_DIR, "README.md"), folderReadme(stats, seconds));
  const files = [...stats.values()].reduce((a, v) => a + v.files, 0);
  const bytes = [...stats.values()].reduce((a, v) => a + v.bytes, 0);
  console.log(`done: ${files} tiles, ${(bytes / 1024 / 1024).toFixed(2)} MiB, ${seconds.toFixed(1)} s`);
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exitCode = 1;
});

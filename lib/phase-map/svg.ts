/**
 * SVG drawing of phase-map symbols: single-phase glyphs, multi-phase station rings (every phase a ring
 * segment, the dominant phase's glyph in the centre) and cluster rings. Returns SVG text, so the same
 * drawing serves the Leaflet layer (as a div icon), the legend and the server-rendered PDF map.
 * Pure and deterministic.
 */
import { INK, TOL_PALE_GREY, labelColourOn } from "./palette";
import type { Shape } from "./symbol-scheme";

/** One phase as drawn: colour/shape from the scheme, confirmed (filled) or candidate (outline). */
export interface SymbolSegment {
  symbol: string;
  colour: string;
  shape: Shape;
  confirmed: boolean;
  /** Relative share of the ring (e.g. wt% or a station count); ≤ 0 or missing counts as equal shares. */
  weight?: number | null;
}

export interface DrawnSymbol {
  svg: string;
  /** Width = height of the drawing, px. */
  size: number;
}

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
const f = (v: number) => (Math.round(v * 100) / 100).toString();

/**
 * SVG path data of a glyph shape centred on (cx, cy) with "radius" r (px). Shapes with corners are
 * scaled so all of them look about as large as the circle (equal-area-ish, our own factors).
 */
export function shapePath(shape: Shape, cx: number, cy: number, r: number): string {
  const poly = (n: number, rot: number, k: number, inner?: number) => {
    const pts: string[] = [];
    const m = inner ? n * 2 : n;
    for (let i = 0; i < m; i++) {
      const rr = inner && i % 2 === 1 ? r * k * inner : r * k;
      const a = rot + (i * 2 * Math.PI) / m;
      pts.push(`${f(cx + rr * Math.sin(a))},${f(cy - rr * Math.cos(a))}`);
    }
    return `M${pts.join("L")}Z`;
  };
  switch (shape) {
    case "circle":
      return `M${f(cx - r)},${f(cy)}a${f(r)},${f(r)} 0 1,0 ${f(2 * r)},0a${f(r)},${f(r)} 0 1,0 ${f(-2 * r)},0Z`;
    case "square":
      return poly(4, Math.PI / 4, 1.22);
    case "diamond":
      return poly(4, 0, 1.3);
    case "triangle":
      return poly(3, 0, 1.45);
    case "triangle-down":
      return poly(3, Math.PI, 1.45);
    case "pentagon":
      return poly(5, 0, 1.12);
    case "hexagon":
      return poly(6, 0, 1.08);
    case "star":
      return poly(5, 0, 1.4, 0.5);
  }
}

/** Angle 0 at 12 o'clock, clockwise, radians → point. */
const pt = (cx: number, cy: number, r: number, a: number) => [cx + r * Math.sin(a), cy - r * Math.cos(a)] as const;

/** Path of an annular sector from angle a0 to a1 (radians, clockwise from north); full circles split in two. */
export function annularSectorPath(cx: number, cy: number, rOuter: number, rInner: number, a0: number, a1: number): string {
  if (a1 - a0 >= 2 * Math.PI - 1e-9) {
    const mid = a0 + Math.PI;
    return annularSectorPath(cx, cy, rOuter, rInner, a0, mid) + annularSectorPath(cx, cy, rOuter, rInner, mid, a0 + 2 * Math.PI);
  }
  const large = a1 - a0 > Math.PI ? 1 : 0;
  const [x0, y0] = pt(cx, cy, rOuter, a0);
  const [x1, y1] = pt(cx, cy, rOuter, a1);
  const [x2, y2] = pt(cx, cy, rInner, a1);
  const [x3, y3] = pt(cx, cy, rInner, a0);
  return `M${f(x0)},${f(y0)}A${f(rOuter)},${f(rOuter)} 0 ${large},1 ${f(x1)},${f(y1)}L${f(x2)},${f(y2)}A${f(rInner)},${f(rInner)} 0 ${large},0 ${f(x3)},${f(y3)}Z`;
}

/** Shares of the ring: proportional to the weights when every segment has one, else equal. */
export function segmentShares(segments: readonly Pick<SymbolSegment, "weight">[]): number[] {
  const n = segments.length;
  if (n === 0) return [];
  const w = segments.map((s) => (s.weight != null && Number.isFinite(s.weight) && s.weight > 0 ? s.weight : 0));
  const total = w.reduce((a, b) => a + b, 0);
  if (w.some((x) => x === 0) || total <= 0) return segments.map(() => 1 / n);
  return w.map((x) => x / total);
}

function glyph(seg: SymbolSegment, cx: number, cy: number, r: number, fontPx: number): string {
  const d = shapePath(seg.shape, cx, cy, r);
  const body = seg.confirmed
    ? `<path d="${d}" fill="${seg.colour}" stroke="${INK}" stroke-width="1.2"/>`
    : `<path d="${d}" fill="#FFFFFF" stroke="${INK}" stroke-width="3.2"/><path d="${d}" fill="#FFFFFF" stroke="${seg.colour}" stroke-width="2" stroke-dasharray="3 1.6"/>`;
  const text = seg.confirmed ? labelColourOn(seg.colour) : INK;
  const label = fontPx > 0 ? `<text x="${f(cx)}" y="${f(cy)}" dy="0.35em" text-anchor="middle" font-family="Inter,Helvetica,Arial,sans-serif" font-size="${f(fontPx)}" font-weight="700" fill="${text}">${esc(seg.symbol)}</text>` : "";
  return body + label;
}

const wrap = (size: number, inner: string, title?: string) =>
  `<svg xmlns="http://www.w3.org/2000/svg" width="${size}" height="${size}" viewBox="0 0 ${size} ${size}">${title ? `<title>${esc(title)}</title>` : ""}${inner}</svg>`;

export interface GlyphOptions {
  /** Glyph radius, px. @default 11 */
  radius?: number;
  /** Draw the IMA symbol inside. @default true */
  label?: boolean;
  title?: string;
}

/** One phase as a glyph (shape, filled if confirmed, dashed outline if candidate, IMA label inside). */
export function phaseGlyphSvg(seg: SymbolSegment, options: GlyphOptions = {}): DrawnSymbol {
  const { radius = 11, label = true, title } = options;
  const pad = 4 + radius * 0.5;
  const size = Math.ceil(2 * (radius + pad));
  const c = size / 2;
  const font = label ? Math.max(6, Math.min(radius * 0.85, 11) * (seg.symbol.length > 3 ? 0.8 : 1)) : 0;
  return { svg: wrap(size, glyph(seg, c, c, radius, font), title), size };
}

/**
 * Glyph radius for a wt% (px): square-root scaling so the glyph's area grows with the amount (common
 * cartographic practice for proportional symbols), between `min` and `max`; unknown wt% → the middle.
 */
export function radiusForWtPercent(wt: number | null | undefined, min = 8, max = 16): number {
  if (wt == null || !Number.isFinite(wt)) return (min + max) / 2;
  const v = Math.max(0, Math.min(100, wt));
  return min + (max - min) * Math.sqrt(v / 100);
}

export interface StationSymbolOptions {
  /** Outer radius of the ring, px. @default 18 */
  radius?: number;
  /** Ring width, px. @default 6 */
  ringWidth?: number;
  title?: string;
}

/**
 * A station: no phases → a small grey open circle ("no result yet"); one phase → its glyph; several →
 * a ring with one segment per phase (share by weight, e.g. wt%) around the glyph of the phase with the
 * largest weight (confirmed before candidates). Every phase stays visible as its own segment.
 */
export function stationSymbolSvg(segments: readonly SymbolSegment[], options: StationSymbolOptions = {}): DrawnSymbol {
  const { radius = 18, ringWidth = 6, title } = options;
  if (segments.length === 0) {
    const size = 16;
    return { svg: wrap(size, `<circle cx="8" cy="8" r="5" fill="#FFFFFF" stroke="${INK}" stroke-width="1.5"/><circle cx="8" cy="8" r="2" fill="${TOL_PALE_GREY}"/>`, title), size };
  }
  if (segments.length === 1) return phaseGlyphSvg(segments[0], { radius: Math.min(radius, 16), title });
  const size = Math.ceil(2 * radius + 4);
  const c = size / 2;
  const shares = segmentShares(segments);
  let a = 0;
  const parts: string[] = [`<circle cx="${f(c)}" cy="${f(c)}" r="${f(radius + 1)}" fill="#FFFFFF" stroke="${INK}" stroke-width="1.2"/>`];
  segments.forEach((s, i) => {
    const a1 = a + shares[i] * 2 * Math.PI;
    const d = annularSectorPath(c, c, radius, radius - ringWidth, a, a1);
    parts.push(
      s.confirmed
        ? `<path d="${d}" fill="${s.colour}" stroke="${INK}" stroke-width="0.8"/>`
        : candidateSector(d, s.colour),
    );
    a = a1;
  });
  const lead = dominantIndex(segments);
  const inner = radius - ringWidth - 1.5;
  parts.push(glyph(segments[lead], c, c, Math.max(4, inner * 0.78), Math.max(6, Math.min(inner * 0.9, 9)) * (segments[lead].symbol.length > 3 ? 0.8 : 1)));
  return { svg: wrap(size, parts.join(""), title), size };
}

/** A candidate ring segment: white inside, dashed in the phase colour over a dark edge (readable for pale colours). */
const candidateSector = (d: string, colour: string) =>
  `<path d="${d}" fill="#FFFFFF" stroke="${INK}" stroke-width="2.4"/><path d="${d}" fill="#FFFFFF" stroke="${colour}" stroke-width="1.4" stroke-dasharray="2.4 1.2"/>`;

/** Index of the segment shown in the centre: confirmed first, then largest weight, then first. */
export function dominantIndex(segments: readonly SymbolSegment[]): number {
  let best = 0;
  for (let i = 1; i < segments.length; i++) {
    const a = segments[i];
    const b = segments[best];
    if (a.confirmed !== b.confirmed) {
      if (a.confirmed) best = i;
      continue;
    }
    if ((a.weight ?? 0) > (b.weight ?? 0)) best = i;
  }
  return best;
}

/**
 * A cluster: ring segments by weight (e.g. number of stations with each phase; confirmed parts filled,
 * candidate-only parts outlined) around a white disc with the station count.
 */
export function clusterSymbolSvg(segments: readonly SymbolSegment[], count: number, options: { title?: string } = {}): DrawnSymbol {
  const radius = count >= 1000 ? 24 : count >= 100 ? 21 : count >= 10 ? 19 : 17;
  const ring = 6;
  const size = Math.ceil(2 * radius + 6);
  const c = size / 2;
  const parts: string[] = [`<circle cx="${f(c)}" cy="${f(c)}" r="${f(radius + 2)}" fill="#FFFFFF" stroke="${INK}" stroke-width="2"/>`];
  if (segments.length === 0) parts.push(`<circle cx="${f(c)}" cy="${f(c)}" r="${f(radius - ring / 2)}" fill="none" stroke="${TOL_PALE_GREY}" stroke-width="${ring}"/>`);
  const shares = segmentShares(segments);
  let a = 0;
  segments.forEach((s, i) => {
    const a1 = a + shares[i] * 2 * Math.PI;
    const d = annularSectorPath(c, c, radius, radius - ring, a, a1);
    parts.push(
      s.confirmed
        ? `<path d="${d}" fill="${s.colour}" stroke="${INK}" stroke-width="0.8"/>`
        : candidateSector(d, s.colour),
    );
    a = a1;
  });
  const label = count >= 10000 ? `${Math.round(count / 1000)}k` : String(count);
  parts.push(
    `<text x="${f(c)}" y="${f(c)}" dy="0.35em" text-anchor="middle" font-family="Inter,Helvetica,Arial,sans-serif" font-size="${label.length > 3 ? 10 : 12}" font-weight="700" fill="${INK}">${esc(label)}</text>`,
  );
  return { svg: wrap(size, parts.join(""), options.title), size };
}

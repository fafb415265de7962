/**
 * Map symbols for structural measurements, as drawn on geological maps (common practice; the forms follow the
 * FGDC Digital Cartographic Standard for Geologic Map Symbolization, FGDC-STD-013-2006, sections on planar and
 * linear features — recalled from memory, not copied):
 * - inclined plane: a strike line through the station and a short tick on the dip side, the dip value beside the tick;
 * - vertical plane: the strike line with a tick on both sides, no number;
 * - horizontal plane: a circle with a cross, no number;
 * - overturned plane: as inclined, the tick ends in a hook;
 * - plunging line: an arrow from the station towards the trend, the plunge value at its head;
 * - horizontal line: a two-headed arrow along the trend; vertical line: a circle with a dot.
 *
 * Geometry is in screen pixels with the station at (0, 0), x to the east and y DOWN (south), north up; an azimuth
 * `a` (clockwise from north) points along (sin a, −cos a). Planes are stored as dip direction/dip; the strike is the
 * right-hand-rule strike (dip direction − 90°). Pure: no DOM, no Leaflet.
 */
import { normalizeAzimuth } from "@/lib/geo/angles";
import { strikeFromDipDirection } from "@/lib/geo/structure";

export type StructureAttitude =
  | { kind: "planar"; dipDirection: number; dip: number; overturned?: boolean }
  | { kind: "linear"; trend: number; plunge: number };

export type SymbolVariant = "inclined" | "vertical" | "horizontal" | "overturned" | "plunging-line" | "horizontal-line" | "vertical-line";

export interface Pt {
  x: number;
  y: number;
}

export interface StructureSymbol {
  variant: SymbolVariant;
  /** Right-hand-rule strike of a plane, degrees. */
  strike: number | null;
  /** Azimuth the dip tick (plane) or arrow (line) points to, degrees. */
  pointsTo: number | null;
  /** Straight strokes. */
  lines: [Pt, Pt][];
  /** Filled triangles (arrow heads). */
  heads: [Pt, Pt, Pt][];
  /** Circle radius for horizontal planes and vertical lines (centred on the station), else null. */
  circle: number | null;
  /** Dot at the station (vertical line). */
  dot: boolean;
  /** The number to print (dip or plunge, whole degrees), or null. */
  label: string | null;
  /** Where the label's centre goes. */
  labelAt: Pt | null;
}

export interface SymbolSize {
  /** Half the strike line, px. @default 14 */
  half?: number;
  /** Dip tick, px. @default 7 */
  tick?: number;
  /** Line arrow length, px. @default 20 */
  arrow?: number;
}

/** Dips within this many degrees of 0 or 90 count as horizontal or vertical (readings are to the whole degree). */
export const FLAT_OR_VERTICAL_TOLERANCE = 0.5;

const dir = (az: number): Pt => {
  const r = (az * Math.PI) / 180;
  return { x: Math.sin(r), y: -Math.cos(r) };
};
const at = (az: number, len: number, from: Pt = { x: 0, y: 0 }): Pt => {
  const d = dir(az);
  return { x: round(from.x + d.x * len), y: round(from.y + d.y * len) };
};
const round = (v: number) => Math.round(v * 1000) / 1000 + 0;

function head(tip: Pt, az: number, len = 6, halfWidth = 3.5): [Pt, Pt, Pt] {
  const base = at(az + 180, len, tip);
  return [tip, at(az + 90, halfWidth, base), at(az - 90, halfWidth, base)];
}

/** The symbol of one measurement. Throws a RangeError on an azimuth outside 0–360° or an inclination outside 0–90°. */
export function structureSymbol(att: StructureAttitude, size: SymbolSize = {}): StructureSymbol {
  const half = size.half ?? 14;
  const tick = size.tick ?? 7;
  const arrow = size.arrow ?? 20;
  const [az, inc, what] = att.kind === "planar" ? [att.dipDirection, att.dip, "dip"] : [att.trend, att.plunge, "plunge"];
  if (!Number.isFinite(az) || az < 0 || az > 360) throw new RangeError(`${att.kind === "planar" ? "dip direction" : "trend"} must be 0–360°, got ${az}`);
  if (!Number.isFinite(inc) || inc < 0 || inc > 90) throw new RangeError(`${what} must be 0–90°, got ${inc}`);
  const azimuth = normalizeAzimuth(az);
  const flat = inc < FLAT_OR_VERTICAL_TOLERANCE;
  const upright = inc > 90 - FLAT_OR_VERTICAL_TOLERANCE;
  const label = String(Math.round(inc));

  if (att.kind === "planar") {
    const strike = strikeFromDipDirection(azimuth);
    const base = { strike, pointsTo: azimuth, heads: [] as [Pt, Pt, Pt][], dot: false };
    if (flat) {
      const r = half * 0.45;
      return { ...base, pointsTo: null, variant: "horizontal", lines: [[{ x: -r, y: 0 }, { x: r, y: 0 }], [{ x: 0, y: -r }, { x: 0, y: r }]], circle: r, label: null, labelAt: null };
    }
    const strikeLine: [Pt, Pt] = [at(strike + 180, half), at(strike, half)];
    if (upright) {
      return { ...base, variant: "vertical", lines: [strikeLine, [at(azimuth + 180, tick), at(azimuth, tick)]], circle: null, label: null, labelAt: null };
    }
    const tickEnd = at(azimuth, tick);
    const lines: [Pt, Pt][] = [strikeLine, [{ x: 0, y: 0 }, tickEnd]];
    // Overturned: the tick bends back towards the strike direction (a hook).
    if (att.overturned) lines.push([tickEnd, at(strike, tick * 0.6, tickEnd)]);
    return { ...base, variant: att.overturned ? "overturned" : "inclined", lines, circle: null, label, labelAt: at(azimuth, tick + 8) };
  }

  if (upright) return { variant: "vertical-line", strike: null, pointsTo: null, lines: [], heads: [], circle: half * 0.4, dot: true, label: null, labelAt: null };
  if (flat) {
    const a = at(azimuth, arrow * 0.6);
    const b = at(azimuth + 180, arrow * 0.6);
    return { variant: "horizontal-line", strike: null, pointsTo: azimuth, lines: [[b, a]], heads: [head(a, azimuth), head(b, azimuth + 180)], circle: null, dot: false, label: null, labelAt: null };
  }
  const tip = at(azimuth, arrow);
  return { variant: "plunging-line", strike: null, pointsTo: azimuth, lines: [[{ x: 0, y: 0 }, tip]], heads: [head(tip, azimuth)], circle: null, dot: false, label, labelAt: at(azimuth, arrow + 8) };
}

const f = (v: number) => String(Math.round(v * 10) / 10);

/**
 * The symbol as an SVG string, `box` px square with the station at its centre (for a Leaflet divIcon).
 * `colour` strokes and fills; the number gets a white halo so it reads on any basemap.
 */
export function structureSymbolSvg(sym: StructureSymbol, { box = 64, colour = "#111", title }: { box?: number; colour?: string; title?: string } = {}): string {
  const c = box / 2;
  const p = (pt: Pt) => `${f(pt.x + c)},${f(pt.y + c)}`;
  const parts: string[] = [];
  if (title) parts.push(`<title>${title.replace(/[<>&"]/g, (ch) => `&#${ch.charCodeAt(0)};`)}</title>`);
  const segs = sym.lines.map(([a, b]) => `<line x1="${f(a.x + c)}" y1="${f(a.y + c)}" x2="${f(b.x + c)}" y2="${f(b.y + c)}"/>`).join("");
  // A white halo under the strokes keeps the symbol readable over station markers and any basemap.
  if (segs) parts.push(`<g stroke="#fff" stroke-width="5">${segs}</g>`, segs);
  for (const h of sym.heads) parts.push(`<polygon points="${h.map(p).join(" ")}" fill="${colour}" stroke="none"/>`);
  if (sym.circle != null) parts.push(`<circle cx="${c}" cy="${c}" r="${f(sym.circle)}" fill="none"/>`);
  if (sym.dot) parts.push(`<circle cx="${c}" cy="${c}" r="1.8" fill="${colour}" stroke="none"/>`);
  if (sym.label && sym.labelAt) {
    parts.push(
      `<text x="${f(sym.labelAt.x + c)}" y="${f(sym.labelAt.y + c)}" text-anchor="middle" dominant-baseline="central" font-size="11" font-weight="600" fill="${colour}" stroke="#fff" stroke-width="3" paint-order="stroke" font-family="system-ui, sans-serif">${sym.label}</text>`,
    );
  }
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${box}" height="${box}" viewBox="0 0 ${box} ${box}" stroke="${colour}" stroke-width="2" stroke-linecap="round">${parts.join("")}</svg>`;
}

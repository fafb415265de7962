import { DOMParser } from "@xmldom/xmldom";
import sharp from "sharp";
import { describe, expect, test } from "vitest";
import { INK, TOL_MUTED, annularSectorPath, clusterSymbolSvg, phaseGlyphSvg, phaseSymbol, radiusForWtPercent, segmentShares, shapePath, SHAPES, stationSymbolSvg, type SymbolSegment } from "@/lib/phase-map";

const seg = (mineral: string, group: string, confirmed: boolean, weight: number | null = null): SymbolSegment => {
  const s = phaseSymbol(mineral, group);
  return { symbol: s.symbol, colour: s.colour, shape: s.shape, confirmed, weight };
};

/** Renders SVG with librsvg (through sharp) and returns the RGBA pixel at (x, y). */
async function pixel(svg: string, x: number, y: number): Promise<[number, number, number, number]> {
  const { data, info } = await sharp(Buffer.from(svg)).ensureAlpha().raw().toBuffer({ resolveWithObject: true });
  const i = (Math.round(y) * info.width + Math.round(x)) * 4;
  return [data[i], data[i + 1], data[i + 2], data[i + 3]];
}
const hex = (h: string) => [parseInt(h.slice(1, 3), 16), parseInt(h.slice(3, 5), 16), parseInt(h.slice(5, 7), 16)];

describe("symbol SVG", () => {
  test("every glyph and ring is well-formed XML (checked with @xmldom/xmldom)", () => {
    const errors: string[] = [];
    const parse = (svg: string) => new DOMParser({ onError: (_l, m) => errors.push(m) }).parseFromString(svg, "image/svg+xml");
    for (const shape of SHAPES) parse(phaseGlyphSvg({ symbol: "A&B", colour: TOL_MUTED.teal, shape, confirmed: false }).svg);
    const doc = parse(stationSymbolSvg([seg("quartz", "silica", true, 60), seg("pyrite", "sulfide", true, 30), seg("kaolinite", "clay", false)]).svg);
    expect(errors).toEqual([]);
    // Two confirmed segments (one path each), a candidate segment (dark edge + dashed colour: two paths)
    // and the centre glyph (one path when confirmed); the background disc is a <circle>.
    expect(doc.getElementsByTagName("path").length).toBe(5);
    expect(doc.getElementsByTagName("circle").length).toBe(1);
    expect(doc.getElementsByTagName("text")[0].textContent).toBe("Qz");
  });

  test("confirmed is filled with the group colour, a candidate is white inside (rendered by librsvg)", async () => {
    const confirmed = phaseGlyphSvg(seg("pyrite", "sulfide", true), { radius: 12, label: false });
    const candidate = phaseGlyphSvg(seg("pyrite", "sulfide", false), { radius: 12, label: false });
    const c = confirmed.size / 2;
    expect((await pixel(confirmed.svg, c, c)).slice(0, 3)).toEqual(hex(TOL_MUTED.wine));
    expect((await pixel(candidate.svg, c, c)).slice(0, 3)).toEqual([255, 255, 255]);
  });

  test("a multi-phase ring shows each phase in its own segment with its share of the circle", async () => {
    // Quartz 75 %, pyrite 25 %: clockwise from 12 o'clock quartz fills 0–270°, pyrite 270–360°.
    const { svg, size } = stationSymbolSvg([seg("quartz", "silica", true, 75), seg("pyrite", "sulfide", true, 25)], { radius: 20, ringWidth: 8 });
    const c = size / 2;
    const r = 16; // middle of the ring
    const at = (deg: number) => pixel(svg, c + r * Math.sin((deg * Math.PI) / 180), c - r * Math.cos((deg * Math.PI) / 180));
    expect((await at(135)).slice(0, 3)).toEqual(hex(TOL_MUTED.cyan));
    expect((await at(315)).slice(0, 3)).toEqual(hex(TOL_MUTED.wine));
  });

  test("a station without results is a small grey open circle; a single phase is a bare glyph", () => {
    expect(stationSymbolSvg([]).size).toBe(16);
    expect(stationSymbolSvg([seg("calcite", "carbonate", true)]).svg).not.toContain('stroke-dasharray');
    expect(stationSymbolSvg([seg("calcite", "carbonate", false)]).svg).toContain('stroke-dasharray');
  });

  test("deterministic output for the same input", () => {
    const a = stationSymbolSvg([seg("quartz", "silica", true, 40), seg("goethite", "hydroxide", false)]);
    const b = stationSymbolSvg([seg("quartz", "silica", true, 40), seg("goethite", "hydroxide", false)]);
    expect(a).toEqual(b);
    expect(clusterSymbolSvg([seg("quartz", "silica", true, 3)], 12)).toEqual(clusterSymbolSvg([seg("quartz", "silica", true, 3)], 12));
  });

  test("shares follow the weights only when every segment has one", () => {
    expect(segmentShares([{ weight: 30 }, { weight: 10 }])).toEqual([0.75, 0.25]);
    expect(segmentShares([{ weight: 30 }, { weight: null }])).toEqual([0.5, 0.5]);
    expect(segmentShares([])).toEqual([]);
  });

  test("proportional glyphs: area grows linearly with wt% above the minimum size", () => {
    // Square-root scaling (common cartographic practice for proportional symbols).
    const r = (wt: number) => radiusForWtPercent(wt, 0, 10);
    expect(r(100) ** 2 / r(25) ** 2).toBeCloseTo(4, 10);
    expect(radiusForWtPercent(null, 8, 16)).toBe(12);
    expect(radiusForWtPercent(250, 8, 16)).toBe(16);
  });

  test("a full-circle sector is drawn as two half arcs (an SVG arc cannot start and end at one point)", () => {
    const d = annularSectorPath(10, 10, 8, 4, 0, 2 * Math.PI);
    expect(d.match(/M/g)).toHaveLength(2);
    expect(shapePath("circle", 0, 0, 1)).toMatch(/^M-1,0a1,1/);
    expect(INK).toMatch(/^#[0-9A-F]{6}$/);
  });
});

import { describe, expect, test } from "vitest";
import { structureSymbol, structureSymbolSvg } from "@/lib/map/structure-symbols";

// Screen frame: x east, y down (south). A unit step towards azimuth a is (sin a, −cos a).
const unit = (p: { x: number; y: number }) => {
  const l = Math.hypot(p.x, p.y);
  return { x: p.x / l, y: p.y / l };
};

describe("strike/dip symbols", () => {
  test("strike 090, dip 30 S: the strike line runs E–W and the tick points to 180 (south), labelled 30", () => {
    // Right-hand rule (dip to the right when facing along strike): strike 090 dipping south → dip direction 180
    // (Ragan, Structural Geology: An Introduction to Geometrical Techniques, 4th ed. 2009, ch. 1 — from memory).
    const s = structureSymbol({ kind: "planar", dipDirection: 180, dip: 30 });
    expect(s.variant).toBe("inclined");
    expect(s.strike).toBe(90);
    expect(s.pointsTo).toBe(180);
    const [strikeLine, tick] = s.lines;
    expect(strikeLine[0].y).toBeCloseTo(0, 6);
    expect(strikeLine[1].y).toBeCloseTo(0, 6);
    expect(Math.abs(strikeLine[1].x - strikeLine[0].x)).toBeCloseTo(28, 6);
    expect(unit(tick[1])).toEqual({ x: expect.closeTo(0, 6), y: expect.closeTo(1, 6) }); // down = south
    expect(s.label).toBe("30");
    expect(s.labelAt!.y).toBeGreaterThan(tick[1].y);
  });

  test("right-hand rule: dip direction 045 → strike 315, tick towards NE; dip direction 000 → strike 270", () => {
    const ne = structureSymbol({ kind: "planar", dipDirection: 45, dip: 60 });
    expect(ne.strike).toBe(315);
    const t = unit(ne.lines[1][1]);
    expect(t.x).toBeCloseTo(Math.SQRT1_2, 4);
    expect(t.y).toBeCloseTo(-Math.SQRT1_2, 4);
    // the tick is perpendicular to the strike line
    const sl = ne.lines[0];
    expect((sl[1].x - sl[0].x) * ne.lines[1][1].x + (sl[1].y - sl[0].y) * ne.lines[1][1].y).toBeCloseTo(0, 2);
    expect(structureSymbol({ kind: "planar", dipDirection: 0, dip: 10 }).strike).toBe(270);
  });

  test("vertical plane: tick on both sides, no number; horizontal plane: circle with a cross, no number (common practice)", () => {
    const v = structureSymbol({ kind: "planar", dipDirection: 90, dip: 90 });
    expect(v.variant).toBe("vertical");
    expect(v.label).toBeNull();
    const [a, b] = v.lines[1];
    expect(a.x).toBeCloseTo(-b.x, 6);
    expect(a.y).toBeCloseTo(-b.y, 6);
    const h = structureSymbol({ kind: "planar", dipDirection: 200, dip: 0 });
    expect(h.variant).toBe("horizontal");
    expect(h.circle).toBeGreaterThan(0);
    expect(h.lines).toHaveLength(2);
    expect(h.label).toBeNull();
  });

  test("overturned plane gets a hook at the tick end", () => {
    const o = structureSymbol({ kind: "planar", dipDirection: 180, dip: 70, overturned: true });
    expect(o.variant).toBe("overturned");
    expect(o.lines).toHaveLength(3);
    expect(o.lines[2][0]).toEqual(o.lines[1][1]);
  });

  test("lineation 030/25: arrow towards 030 with the plunge at its head; horizontal → two heads; vertical → circle and dot", () => {
    const l = structureSymbol({ kind: "linear", trend: 30, plunge: 25 });
    expect(l.variant).toBe("plunging-line");
    const d = unit(l.lines[0][1]);
    // coordinates are rounded to 0.001 px
    expect(d.x).toBeCloseTo(Math.sin(Math.PI / 6), 4);
    expect(d.y).toBeCloseTo(-Math.cos(Math.PI / 6), 4);
    expect(l.heads).toHaveLength(1);
    expect(l.heads[0][0]).toEqual(l.lines[0][1]);
    expect(l.label).toBe("25");
    expect(structureSymbol({ kind: "linear", trend: 120, plunge: 0 }).heads).toHaveLength(2);
    const v = structureSymbol({ kind: "linear", trend: 0, plunge: 90 });
    expect([v.variant, v.dot, v.label]).toEqual(["vertical-line", true, null]);
  });

  test("out-of-range readings are refused by name", () => {
    expect(() => structureSymbol({ kind: "planar", dipDirection: 400, dip: 10 })).toThrow(/dip direction must be 0–360°, got 400/);
    expect(() => structureSymbol({ kind: "linear", trend: 10, plunge: 95 })).toThrow(/plunge must be 0–90°, got 95/);
  });

  test("SVG: station at the centre, the number drawn, the title escaped", () => {
    const svg = structureSymbolSvg(structureSymbol({ kind: "planar", dipDirection: 180, dip: 30 }), { box: 64, title: "Bedding <S0>" });
    expect(svg).toContain('x1="18" y1="32" x2="46" y2="32"'); // strike line E–W through (32, 32)
    expect(svg).toContain('x1="32" y1="32" x2="32" y2="39"'); // tick 7 px south
    expect(svg).toContain(">30</text>");
    expect(svg).toContain("Bedding &#60;S0&#62;");
  });
});

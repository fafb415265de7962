import { describe, expect, test } from "vitest";
import {
  angleLineToPlane,
  dipDirectionFromStrike,
  formatAttitude,
  inclinationProblem,
  azimuthProblem,
  lineFromRake,
  lineLiesInPlane,
  lineVector,
  parseQuadrantBearing,
  planeFromPole,
  planeNormal,
  poleToPlane,
  strikeFromDipDirection,
} from "@/lib/geo/structure";

describe("strike (RHR) ⇄ dip direction", () => {
  test("030/40 RHR dips 40° toward 120° (right-hand rule, common practice; Lisle & Leyshon 2004)", () => {
    expect(dipDirectionFromStrike(30)).toBe(120);
    expect(strikeFromDipDirection(120)).toBe(30);
  });
  test("wraps through north: strike 300 → dd 030; dd 045 → strike 315 (dd = strike + 90 mod 360, common practice)", () => {
    expect(dipDirectionFromStrike(300)).toBe(30);
    expect(strikeFromDipDirection(45)).toBe(315);
    expect(dipDirectionFromStrike(270)).toBe(0);
  });
});

describe("validation ranges (common practice: azimuth 0–360, dip/plunge 0–90)", () => {
  test("dip 95 and strike 400 are refused with a reason", () => {
    expect(inclinationProblem(95)).toMatch(/between 0 and 90/);
    expect(azimuthProblem(400, "Strike")).toMatch(/Strike must be between 0 and 360/);
    expect(inclinationProblem(90)).toBeNull();
    expect(azimuthProblem(0)).toBeNull();
  });
});

describe("vectors", () => {
  test("line and normal formulas (direction cosines in E, N, Up: common practice)", () => {
    // line(t,p) = (cos p sin t, cos p cos t, −sin p): a 30° plunge to 090 → (cos30, 0, −sin30)
    const l = lineVector({ trend: 90, plunge: 30 });
    expect(l[0]).toBeCloseTo(Math.cos(Math.PI / 6), 12);
    expect(l[1]).toBeCloseTo(0, 12);
    expect(l[2]).toBeCloseTo(-0.5, 12);
    // normal(dd,δ) = (sin δ sin dd, sin δ cos dd, cos δ): horizontal plane → up
    const n = planeNormal({ dipDirection: 0, dip: 0 });
    expect(n).toEqual([0, 0, 1]);
  });
});

describe("pole to plane (trend dd+180, plunge 90−δ; Lisle & Leyshon 2004)", () => {
  test("plane 120/40 → pole 300/50, and back", () => {
    expect(poleToPlane({ dipDirection: 120, dip: 40 })).toEqual({ trend: 300, plunge: 50 });
    expect(planeFromPole({ trend: 300, plunge: 50 })).toEqual({ dipDirection: 120, dip: 40 });
  });
  test("the pole is perpendicular to the plane (90° line-to-plane angle)", () => {
    const plane = { dipDirection: 215, dip: 63 };
    expect(angleLineToPlane(poleToPlane(plane), plane)).toBeCloseTo(90, 9);
  });
});

describe("rake → trend/plunge and the lineation-in-plane check", () => {
  test("plane 120/40, rake 45° from strike 030 → trend ≈ 067.5°, plunge ≈ 27.0° (verified with an independent vector calculation)", () => {
    const l = lineFromRake({ dipDirection: 120, dip: 40 }, 45);
    expect(l.trend).toBeCloseTo(67.5, 1);
    expect(l.plunge).toBeCloseTo(27.0, 1);
    expect(lineLiesInPlane(l, { dipDirection: 120, dip: 40 })).toBe(true);
  });
  test("rake 0 is the strike line, rake 90 the dip line (definition of rake, common practice)", () => {
    const p = { dipDirection: 120, dip: 40 };
    const strike = lineFromRake(p, 0);
    expect(strike.trend).toBeCloseTo(30, 9);
    expect(strike.plunge).toBeCloseTo(0, 9);
    const dip = lineFromRake(p, 90);
    expect(dip.trend).toBeCloseTo(120, 9);
    expect(dip.plunge).toBeCloseTo(40, 9);
  });
  test("a line 30° off the plane fails the 10° tolerance |line·normal| < sin 10° (common practice)", () => {
    const plane = { dipDirection: 120, dip: 40 };
    expect(lineLiesInPlane({ trend: 300, plunge: 30 }, plane)).toBe(false);
    // 067/27 is 0.5° from the exact rake-45 line: still in the plane
    expect(lineLiesInPlane({ trend: 67, plunge: 27 }, plane)).toBe(true);
  });
});

describe("formatting and quadrant bearings (import)", () => {
  test("030/40 with zero padding", () => {
    expect(formatAttitude(30, 40)).toBe("030/40");
    expect(formatAttitude(359.7, 5)).toBe("000/05");
  });
  test("N30E → 030, S45W → 225, N10W → 350, S20E → 160 (quadrant notation, common practice)", () => {
    expect(parseQuadrantBearing("N30E")).toBe(30);
    expect(parseQuadrantBearing("S45W")).toBe(225);
    expect(parseQuadrantBearing("n10w")).toBe(350);
    expect(parseQuadrantBearing("S20E")).toBe(160);
    expect(parseQuadrantBearing("N95E")).toBeNull();
  });
});

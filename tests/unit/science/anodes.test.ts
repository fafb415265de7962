import { describe, expect, test } from "vitest";
import { ANODES, parseAnode, resolveWavelength, wavelengthsFor } from "@/lib/science/anodes";

// Reference values (Å): ITC Vol. C (2006) Table 4.2.2.6 (Deslattes et al. 2003) and Hölzer et al. (1997) Phys. Rev. A
// 56, 4554, rounded to where compilations agree (±3×10⁻⁵ Å); Cr, Fe, Co and the Kα2 values are from memory.
const ANODE_TABLE = {
  Cr: { ka1: 2.28975, ka2: 2.29366, ka: 2.29105, kb: 2.0849 },
  Fe: { ka1: 1.93606, ka2: 1.94, ka: 1.93737, kb: 1.7566 },
  Co: { ka1: 1.789, ka2: 1.79288, ka: 1.79029, kb: 1.6208 },
  Cu: { ka1: 1.540593, ka2: 1.54442, ka: 1.54187, kb: 1.3922 },
  Mo: { ka1: 0.709317, ka2: 0.7136, ka: 0.71075, kb: 0.6323 },
} as const;

// Independent library: cctbx eltbx wavelengths table (Bearden 1967 Å* scale, rounded to 1e-5 Å; ~20 ppm low).
const CCTBX = {
  Cr: [2.2897, 2.29361],
  Fe: [1.93604, 1.93998],
  Cu: [1.54056, 1.54439],
  Mo: [0.7093, 0.71359],
  Ag: [0.55941, 0.5638],
} as const;

describe("anode table", () => {
  test.each(Object.entries(ANODE_TABLE))("%s agrees with ITC Vol. C (2006) / Hölzer et al. (1997) within 6×10⁻⁵ Å", (anode, ref) => {
    const w = wavelengthsFor(anode as keyof typeof ANODE_TABLE);
    expect(Math.abs(w.kAlpha1 - ref.ka1)).toBeLessThan(6e-5);
    expect(Math.abs(w.kAlpha2 - ref.ka2)).toBeLessThan(6e-5);
    expect(Math.abs(w.kAlpha - ref.ka)).toBeLessThan(6e-5);
    expect(Math.abs(w.kBeta1 - ref.kb)).toBeLessThan(1e-4);
  });
  test.each(Object.entries(CCTBX))("%s agrees with the cctbx (Bearden Å*) table within 1.5×10⁻⁴ Å", (anode, [a1, a2]) => {
    const w = wavelengthsFor(anode as keyof typeof CCTBX);
    expect(Math.abs(w.kAlpha1 - a1)).toBeLessThan(1.5e-4);
    expect(Math.abs(w.kAlpha2 - a2)).toBeLessThan(1.5e-4);
  });
  test("Ag row (from memory, to be checked): Kα1 0.559421, Kα2 0.563813, Kβ 0.497082 Å", () => {
    const w = wavelengthsFor("Ag");
    expect([w.kAlpha1, w.kAlpha2, w.kBeta1]).toEqual([0.559421, 0.563813, 0.497082]);
  });
  test("Cu Kα1 within 1×10⁻⁵ Å of ITC Vol. C (2006) Table 4.2.2.6: 1.54059292(45) Å", () => {
    expect(Math.abs(wavelengthsFor("Cu").kAlpha1 - 1.54059292)).toBeLessThan(1e-5);
  });
  test("weighted Kα = (2Kα1 + Kα2)/3 for every anode (convention, common practice)", () => {
    for (const a of ANODES) {
      const w = wavelengthsFor(a);
      expect(w.kAlpha).toBeCloseTo((2 * w.kAlpha1 + w.kAlpha2) / 3, 12);
      expect(w.kAlpha2).toBeGreaterThan(w.kAlpha1);
      expect(w.kBeta1).toBeLessThan(w.kAlpha1);
      expect(w.source).toMatch(/memory/);
    }
  });
  test("unknown anode is rejected", () => {
    expect(() => wavelengthsFor("W" as never)).toThrow(RangeError);
  });
});

describe("parseAnode", () => {
  test.each([
    ["Cu", "Cu"],
    ["CU", "Cu"],
    ["copper", "Cu"],
    ["Co K-alpha", "Co"],
    ["Cu K\\a", "Cu"],
    ["mo", "Mo"],
  ])("%s → %s", (text, anode) => expect(parseAnode(text)).toBe(anode));
  test("names no anode", () => {
    expect(parseAnode("tungsten")).toBeUndefined();
    expect(parseAnode("Cux")).toBeUndefined();
  });
});

describe("resolveWavelength", () => {
  test("anode only → Kα1 with Kα2", () => {
    const r = resolveWavelength({ anode: "Co" });
    expect(r.wavelength).toBe(wavelengthsFor("Co").kAlpha1);
    expect(r.wavelength2).toBe(wavelengthsFor("Co").kAlpha2);
    expect(r.source).toBe("anode");
  });
  test("explicit Kα1 is used as given and the anode recognised", () => {
    const r = resolveWavelength({ wavelength: 1.5406 });
    expect(r.wavelength).toBe(1.5406);
    expect(r.anode).toBe("Cu");
    expect(r.kind).toBe("kAlpha1");
  });
  test("a weighted Kα (1.5418 Å) is recognised and replaced by Kα1, with a note", () => {
    const r = resolveWavelength({ wavelength: 1.5418 });
    expect(r.kind).toBe("kAlphaWeighted");
    expect(r.wavelength).toBe(wavelengthsFor("Cu").kAlpha1);
    expect(r.notes.join(" ")).toMatch(/weighted/);
  });
  test("custom wavelength (synchrotron) has no Kα2", () => {
    const r = resolveWavelength({ wavelength: 0.8 });
    expect(r.kind).toBe("custom");
    expect(r.wavelength2).toBeUndefined();
  });
  test("nothing given: error, or the fallback anode with a note", () => {
    expect(() => resolveWavelength({})).toThrow(RangeError);
    const r = resolveWavelength({ fallbackAnode: "Cu" });
    expect(r.source).toBe("default");
    expect(r.notes[0]).toMatch(/assumed/);
  });
  test("invalid wavelength", () => {
    expect(() => resolveWavelength({ wavelength: -1 })).toThrow(RangeError);
    expect(() => resolveWavelength({ wavelength: NaN })).toThrow(RangeError);
  });
});

/** RIR weight fractions and the chemistry filter against published worked examples and plain set logic. */
import { describe, expect, test } from "vitest";
import { normalizeElementFilter, passesElementFilter, rirWeightFractions } from "@/lib/science/identify";

describe("rirWeightFractions (Chung 1974, J. Appl. Cryst. 7, 519)", () => {
  test("Chung (1974) equation, illustrative numbers: I 1000 and 600, RIR 3.0 and 1.5 ⇒ 45 % and 55 %", () => {
    const [a, b] = rirWeightFractions([
      { intensity: 1000, rir: 3.0 },
      { intensity: 600, rir: 1.5 },
    ]);
    // (1000/3) / (1000/3 + 600/1.5) = 333.3 / 733.3 = 45.45 %
    expect(a).toBeCloseTo(45.45, 2);
    expect(b).toBeCloseTo(54.55, 2);
  });
  test("a phase without RIR makes the normalisation impossible ⇒ all null (not a guess)", () => {
    expect(rirWeightFractions([{ intensity: 1, rir: 1 }, { intensity: 1, rir: undefined }])).toEqual([null, null]);
  });
  test("a single phase is 100 % (normalised method assumes no amorphous content)", () => {
    expect(rirWeightFractions([{ intensity: 5, rir: 2 }])).toEqual([100]);
  });
});

describe("element filter (common practice: filter the reference set by chemistry)", () => {
  const calcite = { elements: ["C", "Ca", "O"] };
  test("required / allowed / excluded", () => {
    expect(passesElementFilter(calcite, { required: ["Ca"] })).toBe(true);
    expect(passesElementFilter(calcite, { required: ["Ca", "Mg"] })).toBe(false);
    expect(passesElementFilter(calcite, { allowed: ["Ca", "C", "O", "Si"] })).toBe(true);
    expect(passesElementFilter(calcite, { allowed: ["Ca", "O"] })).toBe(false);
    expect(passesElementFilter(calcite, { excluded: ["Mg"] })).toBe(true);
    expect(passesElementFilter(calcite, { excluded: ["C"] })).toBe(false);
  });
  test("symbols are normalised and checked", () => {
    expect(normalizeElementFilter({ allowed: [" si", "O", "FE"] }).allowed).toEqual(["Si", "O", "Fe"]);
    expect(() => normalizeElementFilter({ required: ["Si", "123"] })).toThrow(/elements\.required\[1\] "123" is not an element symbol/);
  });
});

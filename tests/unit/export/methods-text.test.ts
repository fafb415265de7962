/**
 * The report's Methods sentences from a real processing record: the science core's resolved parameters for the
 * forsterite-marble fixture scan, whose 2θ column is written to 0.001° (5.000, 5.020, …: a 0.02° step, read from
 * the file's own text, not from our code). Floating-point subtraction gives steps like 0.019999999999999574;
 * the report must show the instrument's 0.02.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, test } from "vitest";
import { angle, processingSentences, roundTo } from "@/lib/export/methods-text";
import { parseScan, resolveProcessParams } from "@/lib/science";

const text = readFileSync(join(__dirname, "../../fixtures/scans/forsterite-marble.xy"), "utf8");
const [first, second] = text.split("\n").slice(0, 2).map((l) => l.split(/\s+/)[0]);

describe("processingSentences", () => {
  const scan = parseScan(text, { anode: "Cu" });
  const processing = resolveProcessParams(scan, {}).params;
  const sentences = processingSentences({ requested: {}, resolved: { processing } }).join(" ");

  test("the step is the file's written step (0.02°), not a float artefact", () => {
    const written = (Number(second.replace(".", "")) - Number(first.replace(".", ""))) / 10 ** (second.split(".")[1].length);
    expect(written).toBe(0.02);
    expect(sentences).toContain(`Data step ${written}° 2θ`);
    expect(sentences).not.toMatch(/\d\.\d{6,}/);
  });

  // Cu Kα1 1.540598 Å (Hölzer et al. 1997) is 1.54060 to 5 decimals, written without the trailing zero.
  test("sentences, not JSON: radiation (Cu Kα1 to 5 decimals), smoothing, background, Kα2", () => {
    expect(sentences).not.toMatch(/[{}"]/);
    expect(sentences).toMatch(/Radiation Cu Kα1, λ = 1\.5406 Å/);
    expect(sentences).toMatch(/Savitzky–Golay smoothing .* over \d+ points, polynomial order \d/);
    expect(sentences).toMatch(/Background by SNIP/);
    expect(sentences).toMatch(/Kα2 (stripped|not stripped)/);
  });

  test("a record without resolved settings says so instead of printing it", () => {
    expect(processingSentences({ requested: { smoothing: { windowSize: 11 } } })).toEqual([expect.stringMatching(/did not record its resolved settings/)]);
  });

  test("rounding helpers", () => {
    expect(angle(0.019999999999999574)).toBe("0.02");
    expect(angle(0.01313)).toBe("0.0131");
    expect(roundTo(1.5405929, 5)).toBe("1.54059");
  });
});

import { describe, expect, test } from "vitest";
import { afterManualPosition } from "@/lib/geo/position-source";

// Rule (common practice in field data capture): source, accuracy and fix time describe the saved coordinates.
describe("position metadata after a hand-made position", () => {
  const fix = { locationSource: "device_gnss", horizontalAccuracyM: 4.8, locationFixedAt: "2026-03-14T09:05:22Z" };
  test("typing over a device fix clears the device source, its accuracy radius and fix time", () => {
    expect(afterManualPosition(fix)).toEqual({ locationSource: null, horizontalAccuracyM: null, locationFixedAt: null });
  });
  test("moving the pin after a device fix makes the map the source, with no device accuracy", () => {
    expect(afterManualPosition(fix, "map")).toEqual({ locationSource: "map", horizontalAccuracyM: null, locationFixedAt: null });
  });
  test("a photo's EXIF position is also a measurement: editing it drops its accuracy", () => {
    expect(afterManualPosition({ ...fix, locationSource: "photo_exif" })).toMatchObject({ locationSource: null, horizontalAccuracyM: null });
  });
  test("an accuracy typed by a person for an external receiver is kept", () => {
    expect(afterManualPosition({ locationSource: "external_gnss", horizontalAccuracyM: 2, locationFixedAt: null })).toEqual({ locationFixedAt: null });
  });
});

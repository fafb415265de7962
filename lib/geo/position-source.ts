/**
 * The source and accuracy saved with a position must describe that position: after "use my location" filled in a
 * device fix, a person who types another position or moves the pin has a position the device did not measure, so
 * the device's source, accuracy radius and fix time no longer apply (common practice in field data capture: the
 * metadata follows the coordinates actually recorded). Pure: no framework imports.
 */
export interface PositionMeta<S extends string = string> {
  locationSource: S | null;
  horizontalAccuracyM: number | null;
  locationFixedAt: string | null;
}

/** Sources whose accuracy and time come from the device's fix rather than from a person. */
const MEASURED = new Set(["device_gnss", "photo_exif"]);

/** The patch to apply when the position is typed or moved by hand; `to` names the new source (e.g. "map"), or null. */
export function afterManualPosition<S extends string>(current: PositionMeta<S>, to: S | null = null): Partial<PositionMeta<S>> {
  if (current.locationSource && MEASURED.has(current.locationSource)) return { locationSource: to, horizontalAccuracyM: null, locationFixedAt: null };
  return to ? { locationSource: to, locationFixedAt: null } : { locationFixedAt: null };
}

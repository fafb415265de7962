"use client";

import { useId, useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { formatDmsPair, parseLatLon } from "@/lib/geo/dms";
import { afterManualPosition } from "@/lib/geo/position-source";
import { ELEVATION_REFS, LOCATION_SOURCES } from "@/lib/vocabulary";
import { UtmReadout } from "./utm-readout";
import { ELEVATION_REF_LABELS, LOCATION_SOURCE_LABELS, type ElevationRef, type LocationSource, type LocationValue } from "./location-labels";

export type { ElevationRef, LocationSource, LocationValue };

const formatPair = (lat: number | null, lon: number | null) => (lat == null || lon == null ? "" : `${lat.toFixed(6)}, ${lon.toFixed(6)}`);
const num = (s: string): number | null => (s.trim() === "" ? null : Number(s));

/** Browser geolocation error codes → what to do about it. */
function geoMessage(err: GeolocationPositionError): string {
  if (err.code === err.PERMISSION_DENIED) return "Location permission was refused. Allow location for this site in the browser settings, or type the position.";
  if (err.code === err.POSITION_UNAVAILABLE) return "No position available (no GNSS fix). Move into the open and try again, or type the position.";
  return "No fix within 30 seconds. Try again in the open, or type the position.";
}

/**
 * Position, elevation and accuracy of a station or sample. The position accepts decimal degrees or
 * DMS (37°44'28.3"N 6°37'16.7"W) and shows DMS and UTM back; "Use my location" records the device fix
 * with its 95 % accuracy radius, ellipsoidal altitude and time.
 */
export function LocationFields({
  value,
  onChange,
  errors = {},
  required = false,
  disabled = false,
}: {
  value: LocationValue;
  onChange: (patch: Partial<LocationValue>) => void;
  errors?: Partial<Record<keyof LocationValue, string | undefined>>;
  required?: boolean;
  disabled?: boolean;
}) {
  const id = useId();
  const [text, setText] = useState(formatPair(value.lat, value.lon));
  const [shown, setShown] = useState<[number | null, number | null]>([value.lat, value.lon]);
  const [parseError, setParseError] = useState<string | null>(null);
  const [locating, setLocating] = useState(false);
  const [geoNote, setGeoNote] = useState<string | null>(null);

  // Position changed from outside (device fix, photo, reset): show it unless the text already says so.
  if (value.lat !== shown[0] || value.lon !== shown[1]) {
    setShown([value.lat, value.lon]);
    const p = parseLatLon(text);
    const matches = p.ok && value.lat != null && Math.abs(p.lat - value.lat) < 1e-9 && Math.abs(p.lon - (value.lon ?? NaN)) < 1e-9;
    if (!matches && value.lat != null) {
      setText(formatPair(value.lat, value.lon));
      setParseError(null);
    }
  }

  function onText(t: string) {
    setText(t);
    if (t.trim() === "") {
      setParseError(null);
      onChange({ lat: null, lon: null });
      return;
    }
    const p = parseLatLon(t);
    if (p.ok) {
      setParseError(null);
      // A typed position is not the device's: its source, accuracy and fix time go (lib/geo/position-source.ts).
      onChange({ lat: p.lat, lon: p.lon, ...afterManualPosition(value) });
    } else {
      setParseError(p.error);
      onChange({ lat: null, lon: null });
    }
  }

  function useMyLocation() {
    if (!("geolocation" in navigator)) {
      setGeoNote("This browser cannot report a location; type the position.");
      return;
    }
    setLocating(true);
    setGeoNote(null);
    navigator.geolocation.getCurrentPosition(
      (pos) => {
        setLocating(false);
        const c = pos.coords;
        const patch: Partial<LocationValue> = {
          lat: +c.latitude.toFixed(7),
          lon: +c.longitude.toFixed(7),
          horizontalAccuracyM: Math.round(c.accuracy * 10) / 10,
          locationSource: "device_gnss",
          locationFixedAt: new Date(pos.timestamp).toISOString(),
        };
        // The Geolocation API's altitude is above the WGS84 ellipsoid (W3C Geolocation API).
        if (c.altitude != null) Object.assign(patch, { elevationM: Math.round(c.altitude * 10) / 10, elevationRef: "ellipsoid" });
        onChange(patch);
        setGeoNote(
          `Fix ± ${Math.round(c.accuracy)} m (95 % radius)${c.altitude != null ? `, altitude ${Math.round(c.altitude)} m above the ellipsoid` : ""}.` +
            (c.accuracy > 50 ? " That is coarse — likely a network fix, not GNSS; wait for a better fix or type the position." : ""),
        );
      },
      (err) => {
        setLocating(false);
        setGeoNote(geoMessage(err));
      },
      { enableHighAccuracy: true, timeout: 30_000, maximumAge: 0 },
    );
  }

  const posError = parseError ?? errors.lat ?? errors.lon;
  const hasPos = value.lat != null && value.lon != null;
  return (
    <fieldset className="space-y-3" disabled={disabled}>
      <legend className="text-sm font-semibold text-ink">Location</legend>
      <Field label={`Position (WGS84)${required ? " *" : ""}`} htmlFor={`${id}-pos`} error={posError}>
        <div className="flex flex-col gap-2 sm:flex-row">
          <input
            id={`${id}-pos`}
            className={inputClass}
            value={text}
            onChange={(e) => onText(e.target.value)}
            placeholder={`37.741194, -6.621306  or  37°44'28.3"N 6°37'16.7"W`}
            aria-invalid={posError ? true : undefined}
            aria-describedby={`${id}-pos-readout`}
            autoComplete="off"
            inputMode="text"
            spellCheck={false}
          />
          <Button type="button" variant="secondary" onClick={useMyLocation} disabled={locating || disabled} className="shrink-0">
            {locating ? "Locating…" : "Use my location"}
          </Button>
        </div>
      </Field>
      <p id={`${id}-pos-readout`} className="text-xs text-muted" aria-live="polite" data-testid="position-readout">
        {hasPos ? (
          <>
            <span className="font-medium text-ink">{formatDmsPair(value.lat!, value.lon!)}</span> · <UtmReadout lat={value.lat!} lon={value.lon!} />
          </>
        ) : (
          "Decimal degrees (latitude first, minus for S/W) or degrees–minutes–seconds with N/S/E/W."
        )}
      </p>
      {geoNote && (
        <p className="text-xs text-ink" role="status">
          {geoNote}
        </p>
      )}
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <Field label="Elevation (m)" htmlFor={`${id}-elev`} error={errors.elevationM}>
          <input
            id={`${id}-elev`}
            type="number"
            step="any"
            inputMode="decimal"
            className={inputClass}
            value={value.elevationM ?? ""}
            onChange={(e) => onChange({ elevationM: num(e.target.value) })}
            aria-invalid={errors.elevationM ? true : undefined}
          />
        </Field>
        <Field label="Elevation reference" htmlFor={`${id}-eref`} error={errors.elevationRef}>
          <select id={`${id}-eref`} className={inputClass} value={value.elevationRef ?? ""} onChange={(e) => onChange({ elevationRef: (e.target.value || null) as ElevationRef | null })}>
            <option value="">—</option>
            {ELEVATION_REFS.map((r) => (
              <option key={r} value={r}>
                {ELEVATION_REF_LABELS[r]}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Horizontal accuracy (m)" htmlFor={`${id}-acc`} error={errors.horizontalAccuracyM} hint="Browser fixes: 95 % radius">
          <input
            id={`${id}-acc`}
            type="number"
            step="any"
            min={0}
            inputMode="decimal"
            className={inputClass}
            value={value.horizontalAccuracyM ?? ""}
            onChange={(e) => onChange({ horizontalAccuracyM: num(e.target.value) })}
            aria-invalid={errors.horizontalAccuracyM ? true : undefined}
          />
        </Field>
        <Field label="Position source" htmlFor={`${id}-src`} error={errors.locationSource}>
          <select id={`${id}-src`} className={inputClass} value={value.locationSource ?? ""} onChange={(e) => onChange({ locationSource: (e.target.value || null) as LocationSource | null })}>
            <option value="">—</option>
            {LOCATION_SOURCES.map((s) => (
              <option key={s} value={s}>
                {LOCATION_SOURCE_LABELS[s]}
              </option>
            ))}
          </select>
        </Field>
      </div>
      {value.locationFixedAt && <p className="text-xs text-muted">Fix time: {value.locationFixedAt.replace("T", " ").replace(/\.\d+Z$|Z$/, " UTC")}</p>}
    </fieldset>
  );
}

"use client";

import { useEffect, useState } from "react";

/**
 * UTM of a position, for the location readout. The UTM module brings proj4 (and mgrs), about 44 kB gzip:
 * it loads on demand, once, after the form is shown, so the field pages stay within the first-load budget.
 */
type UtmModule = typeof import("@/lib/geo/utm");
let pending: Promise<UtmModule> | null = null;
const loadUtm = () => (pending ??= import("@/lib/geo/utm"));

export function utmLine(m: UtmModule, lat: number, lon: number): string {
  try {
    return `UTM ${m.formatUtm(m.toUtm(lat, lon))} m (WGS84)`;
  } catch (err) {
    return err instanceof m.UtmRangeError ? err.message : "No UTM for this position.";
  }
}

export function UtmReadout({ lat, lon }: { lat: number; lon: number }) {
  const [utm, setUtm] = useState<UtmModule | null>(null);
  useEffect(() => {
    let live = true;
    void loadUtm().then((m) => {
      if (live) setUtm(m);
    });
    return () => {
      live = false;
    };
  }, []);
  return <span data-testid="utm-readout">{utm ? utmLine(utm, lat, lon) : "UTM …"}</span>;
}

"use client";

import { useId, useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { ANODES } from "@/lib/vocabulary";

interface Values {
  anode: string;
  wavelength: string;
  expectedFwhmDeg: string;
  windowSize: string;
  smoothing: boolean;
  halfWidthDeg: string;
  /** "auto" (decided from the peak shapes), "yes" or "no". */
  kAlpha2: "auto" | "yes" | "no";
  k: string;
  zeroShiftDeg: string;
  tolerance: string;
  allowed: string;
  excluded: string;
}

const num = (s: string) => (s.trim() === "" ? undefined : Number(s.replace(",", ".")));
const list = (s: string) => (s.trim() === "" ? undefined : s.split(/[\s,;]+/).filter(Boolean));

/** Builds the process request body from the form (only what was changed from the defaults is sent). */
export function processBody(v: Values) {
  const processing: Record<string, unknown> = {};
  if (v.anode) processing.anode = v.anode;
  if (num(v.wavelength) !== undefined) processing.wavelength = num(v.wavelength);
  if (num(v.expectedFwhmDeg) !== undefined) processing.expectedFwhmDeg = num(v.expectedFwhmDeg);
  const smoothing: Record<string, unknown> = {};
  if (!v.smoothing) smoothing.enabled = false;
  if (num(v.windowSize) !== undefined) smoothing.windowSize = num(v.windowSize);
  if (Object.keys(smoothing).length) processing.smoothing = smoothing;
  if (num(v.halfWidthDeg) !== undefined) processing.background = { halfWidthDeg: num(v.halfWidthDeg) };
  if (v.kAlpha2 !== "auto") processing.kAlpha2 = { mode: v.kAlpha2 };
  if (num(v.k) !== undefined) processing.peaks = { k: num(v.k) };
  if (num(v.zeroShiftDeg) !== undefined) processing.correction = { zeroShiftDeg: num(v.zeroShiftDeg) };
  const identify: Record<string, unknown> = {};
  if (num(v.tolerance) !== undefined) identify.tolerance = { twoTheta: num(v.tolerance) };
  const elements: Record<string, unknown> = {};
  if (list(v.allowed)) elements.allowed = list(v.allowed);
  if (list(v.excluded)) elements.excluded = list(v.excluded);
  if (Object.keys(elements).length) identify.elements = elements;
  return { ...(Object.keys(processing).length && { processing }), ...(Object.keys(identify).length && { identify }) };
}

/** Re-process with other parameters: a new run, the earlier ones are kept. Empty fields keep the defaults. */
export function ReprocessForm({ onSubmit, busy, fieldErrors, error }: { onSubmit: (body: ReturnType<typeof processBody>) => void; busy: boolean; fieldErrors?: Record<string, string[]>; error?: string | null }) {
  const id = useId();
  const [v, setV] = useState<Values>({ anode: "", wavelength: "", expectedFwhmDeg: "", windowSize: "", smoothing: true, halfWidthDeg: "", kAlpha2: "auto", k: "", zeroShiftDeg: "", tolerance: "", allowed: "", excluded: "" });
  const set = (k: keyof Values) => (e: React.ChangeEvent<HTMLInputElement | HTMLSelectElement>) => setV((s) => ({ ...s, [k]: e.target.type === "checkbox" ? (e.target as HTMLInputElement).checked : e.target.value }));
  const fe = (path: string) => fieldErrors?.[path];
  return (
    <form
      className="space-y-3"
      onSubmit={(e) => {
        e.preventDefault();
        onSubmit(processBody(v));
      }}
    >
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Anode (override)" htmlFor={`${id}-anode`} hint="Empty: the scan's" error={fe("processing.anode")}>
          <select id={`${id}-anode`} className={inputClass} value={v.anode} onChange={set("anode")}>
            <option value="">As uploaded</option>
            {ANODES.map((a) => (
              <option key={a}>{a}</option>
            ))}
          </select>
        </Field>
        <Field label="Wavelength Kα1 (Å, override)" htmlFor={`${id}-wl`} error={fe("processing.wavelength")}>
          <input id={`${id}-wl`} className={inputClass} inputMode="decimal" value={v.wavelength} onChange={set("wavelength")} />
        </Field>
        <Field label="Expected FWHM (° 2θ)" htmlFor={`${id}-fwhm`} hint="Default 0.1; sets the smoothing window" error={fe("processing.expectedFwhmDeg")}>
          <input id={`${id}-fwhm`} className={inputClass} inputMode="decimal" value={v.expectedFwhmDeg} onChange={set("expectedFwhmDeg")} />
        </Field>
        <Field label="Smoothing window (points, odd)" htmlFor={`${id}-win`} hint="Default: auto (≤ FWHM)" error={fe("processing.smoothing.windowSize")}>
          <input id={`${id}-win`} className={inputClass} inputMode="numeric" value={v.windowSize} onChange={set("windowSize")} />
        </Field>
        <Field label="Background half-width (° 2θ)" htmlFor={`${id}-bg`} hint="SNIP; default 0.6" error={fe("processing.background.halfWidthDeg")}>
          <input id={`${id}-bg`} className={inputClass} inputMode="decimal" value={v.halfWidthDeg} onChange={set("halfWidthDeg")} />
        </Field>
        <Field label="Peak threshold k (σ)" htmlFor={`${id}-k`} hint="Default 3" error={fe("processing.peaks.k")}>
          <input id={`${id}-k`} className={inputClass} inputMode="decimal" value={v.k} onChange={set("k")} />
        </Field>
        <Field label="Zero shift (° 2θ)" htmlFor={`${id}-zero`} hint="Observed − true; default 0" error={fe("processing.correction.zeroShiftDeg")}>
          <input id={`${id}-zero`} className={inputClass} inputMode="decimal" value={v.zeroShiftDeg} onChange={set("zeroShiftDeg")} />
        </Field>
        <Field label="Match window (± ° 2θ)" htmlFor={`${id}-tol`} hint="Default 0.1" error={fe("identify.tolerance.twoTheta")}>
          <input id={`${id}-tol`} className={inputClass} inputMode="decimal" value={v.tolerance} onChange={set("tolerance")} />
        </Field>
        <Field label="Allowed elements" htmlFor={`${id}-allow`} hint="e.g. Si, O, Al, K, H (include O, H, C)" error={fe("identify.elements.allowed.0") ?? fe("identify.elements.allowed")}>
          <input id={`${id}-allow`} className={inputClass} value={v.allowed} onChange={set("allowed")} />
        </Field>
        <Field label="Excluded elements" htmlFor={`${id}-excl`} error={fe("identify.elements.excluded.0") ?? fe("identify.elements.excluded")}>
          <input id={`${id}-excl`} className={inputClass} value={v.excluded} onChange={set("excluded")} />
        </Field>
      </div>
      <div className="flex flex-wrap gap-4 text-sm">
        <label className="flex items-center gap-2">
          <input type="checkbox" checked={v.smoothing} onChange={set("smoothing")} /> Savitzky–Golay smoothing
        </label>
        <label className="flex items-center gap-2">
          Kα2 (stripped by Rachinger when present)
          <select className={inputClass} value={v.kAlpha2} onChange={set("kAlpha2")} aria-label="Kα2">
            <option value="auto">Decide from the peak shapes</option>
            <option value="yes">Present</option>
            <option value="no">Absent (Kα1 only)</option>
          </select>
        </label>
      </div>
      {error && (
        <p role="alert" className="text-sm font-medium text-danger">
          {error}
        </p>
      )}
      <Button type="submit" disabled={busy}>
        Re-process (new run)
      </Button>
    </form>
  );
}

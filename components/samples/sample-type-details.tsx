"use client";

import type { FieldErrors, UseFormRegister } from "react-hook-form";
import { Field, inputClass } from "@/components/ui/field";
import type { SampleType } from "@/lib/vocabulary";
import { CORE_PORTIONS, CORE_PORTION_LABELS, CORE_SIZES, FLOW_STATES, FLOW_STATE_LABELS, OTHER_SUBTYPES, OTHER_SUBTYPE_LABELS, SOIL_HORIZONS } from "@/lib/sample-details";
import { asNumber } from "@/components/stations/server-errors";
import type { SampleFormValues } from "./sample-form";

type Reg = UseFormRegister<SampleFormValues>;

/** The fields that belong to one sample type (common practice). */
export function SampleTypeDetails({ type, register, errors }: { type: SampleType; register: Reg; errors: FieldErrors<SampleFormValues> }) {
  const e = (errors.typeDetails ?? {}) as Record<string, { message?: string } | undefined>;
  const msg = (k: string) => e[k]?.message;
  const num = (k: string, label: string, hint?: string) => (
    <Field label={label} htmlFor={`td-${k}`} error={msg(k)} hint={hint}>
      <input id={`td-${k}`} type="number" step="any" inputMode="decimal" className={inputClass} aria-invalid={msg(k) ? true : undefined} {...register(`typeDetails.${k}` as never, { setValueAs: asNumber })} />
    </Field>
  );
  const text = (k: string, label: string, placeholder?: string) => (
    <Field label={label} htmlFor={`td-${k}`} error={msg(k)}>
      <input id={`td-${k}`} className={inputClass} placeholder={placeholder} aria-invalid={msg(k) ? true : undefined} {...register(`typeDetails.${k}` as never)} />
    </Field>
  );
  const select = (k: string, label: string, values: readonly string[], labels?: Record<string, string>) => (
    <Field label={label} htmlFor={`td-${k}`} error={msg(k)}>
      <select id={`td-${k}`} className={inputClass} {...register(`typeDetails.${k}` as never, { setValueAs: (v: string) => v || null })}>
        <option value="">—</option>
        {values.map((v) => (
          <option key={v} value={v}>
            {labels?.[v] ?? v}
          </option>
        ))}
      </select>
    </Field>
  );
  const grid = (children: React.ReactNode) => <div className="grid gap-3 sm:grid-cols-3">{children}</div>;

  switch (type) {
    case "hand_sample":
      return text("representativeness", "Representativeness", "e.g. typical of the whole outcrop; most altered part only");
    case "chip":
      return grid(
        <>
          {num("lengthM", "Chip line length (m)")}
          {num("orientationDeg", "Line orientation (° azimuth)")}
        </>,
      );
    case "channel":
      return grid(
        <>
          {num("fromM", "From (m)")}
          {num("toM", "To (m)")}
          {num("widthCm", "Channel width (cm)")}
        </>,
      );
    case "float":
      return (
        <div className="space-y-2">
          <p className="text-sm text-muted">Float is not in place (transported): its position is only approximate, and it is recorded as in situ = no.</p>
          {text("transportNote", "Where it may have come from", "e.g. boulder train below the ridge, up-slope source likely")}
        </div>
      );
    case "core":
      return grid(
        <>
          {text("holeId", "Hole ID *")}
          {num("fromM", "From depth (m) *")}
          {num("toM", "To depth (m) *")}
          {select("coreSize", "Core size", CORE_SIZES)}
          {select("portion", "Portion", CORE_PORTIONS, CORE_PORTION_LABELS)}
        </>,
      );
    case "soil":
      return grid(
        <>
          {num("depthCm", "Depth (cm)")}
          {select("horizon", "Horizon", SOIL_HORIZONS)}
          {text("sieveFraction", "Sieve fraction", "e.g. −80 mesh (< 180 µm)")}
        </>,
      );
    case "stream_sediment":
      return grid(
        <>
          {text("catchment", "Catchment")}
          {text("fraction", "Fraction", "e.g. −80 mesh (< 180 µm)")}
          {select("flowState", "Water flow", FLOW_STATES, FLOW_STATE_LABELS)}
        </>,
      );
    case "other":
      return grid(
        <>
          {select("subtype", "Kind", OTHER_SUBTYPES, OTHER_SUBTYPE_LABELS)}
          {text("note", "Note")}
        </>,
      );
  }
}

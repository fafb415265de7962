import type { SampleDetails } from "@/lib/validation/sample-details";
import { CORE_PORTION_LABELS, FLOW_STATE_LABELS, OTHER_SUBTYPE_LABELS } from "@/lib/sample-details";

const join = (parts: (string | null | undefined | false)[]) => parts.filter(Boolean).join(" · ") || null;

/** One line with the type-specific fields of a sample (sample types: common practice), or null when there are none. */
export function typeDetailsSummary(d: SampleDetails | null | undefined): string | null {
  if (!d) return null;
  switch (d.kind) {
    case "hand_sample":
      return d.representativeness ?? null;
    case "chip":
      return join([d.lengthM != null && `line ${d.lengthM} m`, d.orientationDeg != null && `toward ${d.orientationDeg}°`]);
    case "channel":
      return join([d.fromM != null && d.toM != null && `${d.fromM}–${d.toM} m`, d.widthCm != null && `${d.widthCm} cm wide`]);
    case "float":
      return join(["not in situ (float)", d.transportNote]);
    case "core":
      return join([`hole ${d.holeId}`, `${d.fromM}–${d.toM} m`, d.coreSize, d.portion && CORE_PORTION_LABELS[d.portion]]);
    case "soil":
      return join([d.depthCm != null && `${d.depthCm} cm deep`, d.horizon && `${d.horizon} horizon`, d.sieveFraction]);
    case "stream_sediment":
      return join([d.catchment && `catchment ${d.catchment}`, d.fraction, d.flowState && FLOW_STATE_LABELS[d.flowState]]);
    case "other":
      return join([d.subtype && OTHER_SUBTYPE_LABELS[d.subtype], d.note]);
  }
}

import type { Scan } from "@/lib/science/types";

/** Options of the scan writers. */
export interface WriteScanOptions {
  /**
   * Write meta (wavelength, anode, instrument, sample, settings) as `# key: value` header comments (XY/CSV).
   * @default true
   */
  header?: boolean;
}

function headerLines(scan: Scan, marker: string): string[] {
  const m = scan.meta;
  const out: string[] = [];
  if (m.wavelength !== undefined) out.push(`${marker} wavelength: ${m.wavelength}`);
  if (m.wavelength2 !== undefined) out.push(`${marker} wavelength2: ${m.wavelength2}`);
  if (m.anode) out.push(`${marker} anode: ${m.anode}`);
  if (m.instrument) out.push(`${marker} instrument: ${m.instrument}`);
  if (m.sampleId) out.push(`${marker} sample: ${m.sampleId}`);
  return out;
}

/**
 * Write a scan as whitespace-separated XY (or XYE when esd is present). Numbers use the shortest round-trip
 * representation, so `parseScan(writeXy(s))` returns the same arrays.
 */
export function writeXy(scan: Scan, options: WriteScanOptions = {}): string {
  const { header = true } = options;
  const parts: string[] = header ? headerLines(scan, "#") : [];
  const { twoTheta, counts, esd } = scan;
  for (let i = 0; i < twoTheta.length; i++) {
    parts.push(esd ? `${twoTheta[i]} ${counts[i]} ${esd[i]}` : `${twoTheta[i]} ${counts[i]}`);
  }
  return parts.join("\n") + "\n";
}

/** Write a scan as CSV with a header row (`2theta,counts[,esd]`); `;` uses decimal commas. */
export function writeCsv(scan: Scan, options: WriteScanOptions & { separator?: "," | ";" } = {}): string {
  const { header = true, separator = "," } = options;
  const fmt = separator === ";" ? (v: number) => String(v).replace(".", ",") : (v: number) => String(v);
  const parts: string[] = header ? headerLines(scan, "#") : [];
  const { twoTheta, counts, esd } = scan;
  parts.push(esd ? ["2theta", "counts", "esd"].join(separator) : ["2theta", "counts"].join(separator));
  for (let i = 0; i < twoTheta.length; i++) {
    parts.push(
      esd
        ? `${fmt(twoTheta[i])}${separator}${fmt(counts[i])}${separator}${fmt(esd[i])}`
        : `${fmt(twoTheta[i])}${separator}${fmt(counts[i])}`,
    );
  }
  return parts.join("\n") + "\n";
}

function cifString(s: string): string {
  return /^[^\s'"_#$;[\]][^\s]*$/.test(s) && !/^(data_|loop_|save_|global_|stop_)/i.test(s) ? s : `'${s.replace(/'(?=\s)/g, "' ")}'`;
}

/** Write a scan as a minimal pdCIF data block (`_pd_meas_2theta_scan`, `_pd_meas_counts_total`, esd as `_su`). */
export function writePdCif(scan: Scan, blockName = "scan"): string {
  const m = scan.meta;
  const parts: string[] = [`data_${blockName.replace(/\s+/g, "_")}`];
  if (m.wavelength !== undefined) parts.push(`_diffrn_radiation_wavelength ${m.wavelength}`);
  if (m.anode) parts.push(`_diffrn_source_target ${m.anode}`);
  if (m.instrument) parts.push(`_diffrn_measurement_device_type ${cifString(m.instrument)}`);
  if (m.sampleId) parts.push(`_pd_spec_id ${cifString(m.sampleId)}`);
  parts.push("loop_", "_pd_meas_2theta_scan", "_pd_meas_counts_total");
  if (scan.esd) parts.push("_pd_meas_counts_total_su");
  const { twoTheta, counts, esd } = scan;
  for (let i = 0; i < twoTheta.length; i++) {
    parts.push(esd ? `${twoTheta[i]} ${counts[i]} ${esd[i]}` : `${twoTheta[i]} ${counts[i]}`);
  }
  return parts.join("\n") + "\n";
}

import type { Scan, ScanMeta } from "@/lib/science/types";
import { wavelengthsFor } from "@/lib/science/anodes";
import { ScanParseError } from "./errors";

/** Limits applied while reading, and the values the caller knows when the file does not say. */
export interface ScanLimits {
  maxPoints: number;
  minPoints: number;
  /** Wavelength, Å, for converting a d column to 2θ when the file gives neither wavelength nor anode. */
  wavelength?: number;
  /** Counting time per step, s, for converting counts per second to counts when the file does not give it. */
  countingTimeS?: number;
}

/** How the columns were read, for {@link PointCollector.finish}. */
export interface ColumnInfo {
  /** Field names used in error messages. */
  x: string;
  y: string;
  e: string;
  /** The x column holds d-spacings (Å) instead of 2θ; `xColumn`/`headerLine` locate it for messages. */
  xIsD?: boolean;
  xColumn?: number;
  headerLine?: number;
  /** Unit of the intensity column when its name says ("cps", "Intensity [counts]"). */
  yUnit?: "counts" | "cps";
  /** Multiplier applied to the x column first (radians → degrees, nm → Å). */
  xScale?: number;
  /** Field name of a per-point counting-time column, when there is one. */
  t?: string;
}

const DEG = Math.PI / 180;

/**
 * Growable typed-array store for (2θ, counts, esd) points with the source line of each point.
 * Amortised O(1) per point (capacity doubling), so reading stays linear in file size.
 */
export class PointCollector {
  private x = new Float64Array(1024);
  private y = new Float64Array(1024);
  private e: Float64Array | null = null;
  private t: Float64Array | null = null;
  private lines = new Int32Array(1024);
  length = 0;

  constructor(private readonly limits: ScanLimits) {}

  private grow(): void {
    const cap = this.x.length * 2;
    const grow = (a: Float64Array) => {
      const b = new Float64Array(cap);
      b.set(a);
      return b;
    };
    this.x = grow(this.x);
    this.y = grow(this.y);
    if (this.e) this.e = grow(this.e);
    if (this.t) this.t = grow(this.t);
    const l = new Int32Array(cap);
    l.set(this.lines);
    this.lines = l;
  }

  /** Add a point; `esd` NaN means "not given"; `time` is the point's counting time when the file has such a column. */
  push(x: number, y: number, esd: number, line: number, time = NaN): void {
    if (this.length >= this.limits.maxPoints) {
      throw new ScanParseError(
        "TOO_MANY_POINTS",
        `more than ${this.limits.maxPoints} data points (raise the maxPoints option if the file is genuine)`,
        { line },
      );
    }
    if (this.length === this.x.length) this.grow();
    const i = this.length++;
    this.x[i] = x;
    this.y[i] = y;
    this.lines[i] = line;
    if (!Number.isNaN(esd)) {
      if (!this.e) this.e = new Float64Array(this.x.length).fill(NaN);
      this.e[i] = esd;
    } else if (this.e) this.e[i] = NaN;
    if (!Number.isNaN(time)) {
      if (!this.t) this.t = new Float64Array(this.x.length).fill(NaN);
      this.t[i] = time;
    } else if (this.t) this.t[i] = NaN;
  }

  /** Line of point i (1-based), or undefined. */
  lineOf(i: number): number | undefined {
    return this.lines[i] > 0 ? this.lines[i] : undefined;
  }

  /** Reverse the stored points (a d column listed with d increasing gives 2θ decreasing). */
  private reverse(): void {
    const n = this.length;
    const rev = (a: Float64Array | Int32Array | null) => {
      if (!a) return;
      for (let i = 0, j = n - 1; i < j; i++, j--) {
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
      }
    };
    rev(this.x);
    rev(this.y);
    rev(this.e);
    rev(this.t);
    rev(this.lines);
  }

  /**
   * Convert a d column (Å) to 2θ by Bragg's law, `2θ = 2·asin(λ/2d)`, with the file's wavelength (or its anode's
   * Kα1), else the caller's. Refuses when no wavelength is known or a d is not above λ/2.
   */
  private convertD(meta: ScanMeta, cols: ColumnInfo): void {
    const n = this.length;
    const where = { line: cols.headerLine, column: cols.xColumn, field: cols.x };
    let lambda: number | undefined;
    let source = "";
    if (meta.wavelength !== undefined) {
      lambda = meta.wavelength;
      source = "the file's wavelength";
    } else if (meta.anode !== undefined) {
      lambda = wavelengthsFor(meta.anode).kAlpha1;
      source = `the file's anode, ${meta.anode} Kα1`;
    } else if (this.limits.wavelength !== undefined && this.limits.wavelength > 0) {
      lambda = this.limits.wavelength;
      source = "the wavelength given with the file";
    }
    if (lambda === undefined) {
      throw new ScanParseError(
        "NEEDS_WAVELENGTH",
        `column "${cols.x}" holds d-spacings; converting them to 2θ needs the wavelength: put it in the file header (e.g. "# wavelength: 1.5406") or give the anode or wavelength with the file`,
        where,
      );
    }
    const { x } = this;
    let prevD = NaN;
    let direction = 0;
    for (let i = 0; i < n; i++) {
      const d = x[i];
      const line = this.lineOf(i);
      if (!Number.isFinite(d)) throw new ScanParseError("NOT_FINITE", `d is ${d}`, { line, field: cols.x });
      if (!(d > lambda / 2)) {
        throw new ScanParseError(
          "D_OUT_OF_RANGE",
          `d = ${d} Å is not above λ/2 = ${(lambda / 2).toPrecision(6)} Å, so it has no diffraction angle at λ = ${lambda} Å`,
          { line, field: cols.x },
        );
      }
      if (i > 0) {
        const dir = Math.sign(d - prevD);
        if (dir === 0) {
          throw new ScanParseError("DUPLICATE_TWO_THETA", `d = ${d} Å repeats the previous point`, { line, field: cols.x });
        }
        if (direction === 0) direction = dir;
        else if (dir !== direction) {
          throw new ScanParseError(
            "NOT_INCREASING",
            `d = ${d} Å breaks the order of the previous points (${direction < 0 ? "decreasing" : "increasing"}); d must change steadily in one direction`,
            { line, field: cols.x },
          );
        }
      }
      prevD = d;
      x[i] = (2 * Math.asin(lambda / (2 * d))) / DEG;
    }
    if (direction > 0) this.reverse();
    meta.settings.dConvertedWithWavelength = lambda;
    (meta.warnings ??= []).push(`column "${cols.x}" holds d-spacings: converted to 2θ with λ = ${lambda} Å (${source})`);
  }

  /**
   * Counts per second and per-point counting times. With the counting time known (a time column, the file's time
   * per step or the caller's), counts per second become counts (`N = rate·t`); when the time varies from point to
   * point, intensities are put on the median time, `y = rate·t_ref`, with the counting-statistics uncertainty
   * `σ = √N·t_ref/t` (Poisson, common practice). Counts per second without a time stay as they are, flagged.
   */
  private convertIntensity(meta: ScanMeta, cols: ColumnInfo, counts: Float64Array, esd: Float64Array | undefined): { counts: Float64Array; esd?: Float64Array } {
    const n = this.length;
    const cps = cols.yUnit === "cps" || (cols.yUnit === undefined && meta.intensityUnit === "cps");
    const warnings = (meta.warnings ??= []);
    let times: Float64Array | null = null;
    let timeSource = "";
    if (this.t) {
      times = this.t.slice(0, n);
      for (let i = 0; i < n; i++) {
        const ti = times[i];
        if (!(Number.isFinite(ti) && ti > 0)) {
          throw new ScanParseError("NOT_NUMERIC", `counting time ${ti} must be a positive number of seconds`, { line: this.lineOf(i), field: cols.t });
        }
      }
      timeSource = `column "${cols.t}"`;
    }
    const fileStep = meta.settings.timePerStep;
    const stepTime =
      typeof fileStep === "number" && fileStep > 0
        ? fileStep
        : this.limits.countingTimeS !== undefined && this.limits.countingTimeS > 0
          ? this.limits.countingTimeS
          : undefined;
    if (!times && stepTime !== undefined) timeSource = typeof fileStep === "number" && fileStep > 0 ? "the file's time per step" : "the time per step given with the file";
    let tMin = stepTime ?? NaN;
    let tMax = stepTime ?? NaN;
    if (times) {
      tMin = Infinity;
      tMax = -Infinity;
      for (let i = 0; i < n; i++) {
        tMin = Math.min(tMin, times[i]);
        tMax = Math.max(tMax, times[i]);
      }
    }
    const constant = !times || tMax - tMin <= 1e-9 * tMax;
    if (!cps && constant) {
      if (cols.yUnit === "counts") meta.intensityUnit = "counts";
      return { counts, esd };
    }
    if (cps && !times && stepTime === undefined) {
      meta.intensityUnit = "cps";
      warnings.push(
        "intensities are counts per second and no counting time is given: kept as counts per second, so the noise model is approximate; give the time per step to convert them to counts",
      );
      return { counts, esd };
    }
    meta.intensityUnit = "counts";
    if (constant) {
      // cps with one counting time: N = rate · t.
      const t = times ? times[0] : (stepTime as number);
      const out = new Float64Array(n);
      for (let i = 0; i < n; i++) out[i] = counts[i] * t;
      const outEsd = esd ? Float64Array.from(esd, (v) => v * t) : undefined;
      meta.settings.countsFromCpsTime = t;
      warnings.push(`intensities in counts per second multiplied by the counting time (${t} s per step, ${timeSource}) to give counts`);
      return { counts: out, ...(outEsd ? { esd: outEsd } : {}) };
    }
    // Variable counting time: rate = N/t (or given as cps); intensities on the median time.
    const sorted = (times as Float64Array).slice().sort();
    const tRef = sorted[n >> 1];
    const out = new Float64Array(n);
    const outEsd = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const t = (times as Float64Array)[i];
      const rate = cps ? counts[i] : counts[i] / t;
      const nCounts = rate * t;
      out[i] = rate * tRef;
      outEsd[i] = esd ? (cps ? esd[i] * tRef : (esd[i] * tRef) / t) : (Math.sqrt(Math.max(nCounts, 1)) * tRef) / t;
    }
    meta.settings.countsNormalisedToTime = tRef;
    warnings.push(
      `counting time varies from ${tMin} to ${tMax} s (${timeSource}): intensities put on ${tRef} s per step, with uncertainties from the counts actually measured`,
    );
    return { counts: out, esd: outEsd };
  }

  /**
   * Check the scan invariants and build the {@link Scan}: enough points, 2θ finite in (0, 180) and strictly
   * increasing, counts finite and ≥ 0, esd (when given for every point) finite and ≥ 0. A d column is converted to
   * 2θ first, counts per second to counts when the counting time is known (see `convertD`, `convertIntensity`).
   */
  finish(meta: ScanMeta, cols: ColumnInfo = { x: "twoTheta", y: "counts", e: "esd" }): Scan {
    const fields = cols;
    const n = this.length;
    if (n === 0) throw new ScanParseError("EMPTY", "no data points found");
    if (n < this.limits.minPoints) {
      throw new ScanParseError("TOO_FEW_POINTS", `only ${n} data points; at least ${this.limits.minPoints} are needed`);
    }
    const { x, y, e } = this;
    if (cols.xScale !== undefined && cols.xScale !== 1) for (let i = 0; i < n; i++) x[i] *= cols.xScale;
    if (cols.xIsD) this.convertD(meta, cols);
    else if (n >= 3 && x[1] < x[0] && x[n - 1] < x[n - 2] && x[n - 1] < x[0]) {
      // Some instruments write a scan from high to low angle: accepted when the whole file runs that way.
      for (let i = 1; i < n; i++) {
        if (x[i] < x[i - 1]) continue;
        const line = this.lineOf(i);
        if (x[i] === x[i - 1]) throw new ScanParseError("DUPLICATE_TWO_THETA", `2θ = ${x[i]}° repeats the previous point`, { line, field: fields.x });
        throw new ScanParseError(
          "NOT_INCREASING",
          `2θ = ${x[i]}° is higher than the previous point (${x[i - 1]}°) in a file that runs from high to low angle; 2θ must change steadily in one direction`,
          { line, field: fields.x },
        );
      }
      this.reverse();
      (meta.warnings ??= []).push("2θ runs from high to low angle in the file: points put in increasing order");
    }
    for (let i = 0; i < n; i++) {
      const xi = x[i];
      const yi = y[i];
      if (i > 0 && xi > x[i - 1] && xi < 180 && yi >= 0 && yi < Infinity) continue; // the common case, no checks left
      const line = this.lineOf(i);
      if (!Number.isFinite(xi)) throw new ScanParseError("NOT_FINITE", `2θ is ${xi}`, { line, field: fields.x });
      if (!(xi > 0 && xi < 180)) {
        throw new ScanParseError("TWO_THETA_OUT_OF_RANGE", `2θ = ${xi}° is outside (0, 180)°`, { line, field: fields.x });
      }
      if (i > 0) {
        const prev = x[i - 1];
        if (xi === prev) {
          throw new ScanParseError(
            "DUPLICATE_TWO_THETA",
            `2θ = ${xi}° repeats the previous point${this.lineOf(i - 1) ? ` (line ${this.lineOf(i - 1)})` : ""}`,
            { line, field: fields.x },
          );
        }
        if (xi < prev) {
          throw new ScanParseError(
            "NOT_INCREASING",
            `2θ = ${xi}° is lower than the previous point (${prev}°); 2θ must increase strictly`,
            { line, field: fields.x },
          );
        }
      }
      if (!Number.isFinite(yi)) throw new ScanParseError("NOT_FINITE", `intensity is ${yi}`, { line, field: fields.y });
      if (yi < 0) throw new ScanParseError("NEGATIVE_COUNTS", `negative intensity ${yi}`, { line, field: fields.y });
    }
    let esd: Float64Array | undefined;
    if (e) {
      for (let i = 0; i < n; i++) {
        const ei = e[i];
        if (ei >= 0 && ei < Infinity) continue;
        const line = this.lineOf(i);
        if (Number.isNaN(ei)) {
          throw new ScanParseError("TOO_FEW_COLUMNS", "uncertainty missing here but given for other points", {
            line,
            field: fields.e,
          });
        }
        if (!Number.isFinite(ei)) throw new ScanParseError("NOT_FINITE", `uncertainty is ${ei}`, { line, field: fields.e });
        if (ei < 0) throw new ScanParseError("NEGATIVE_ESD", `negative uncertainty ${ei}`, { line, field: fields.e });
      }
      esd = e.slice(0, n);
    }
    const converted = this.convertIntensity(meta, cols, y.slice(0, n), esd);
    if (meta.warnings && meta.warnings.length === 0) delete meta.warnings;
    return { twoTheta: x.slice(0, n), counts: converted.counts, ...(converted.esd ? { esd: converted.esd } : {}), meta };
  }
}

import type { Scan, ScanMeta } from "@/lib/science/types";
import { ScanParseError } from "./errors";

/** Limits applied while reading. */
export interface ScanLimits {
  maxPoints: number;
  minPoints: number;
}

/**
 * Growable typed-array store for (2θ, counts, esd) points with the source line of each point.
 * Amortised O(1) per point (capacity doubling), so reading stays linear in file size.
 */
export class PointCollector {
  private x = new Float64Array(1024);
  private y = new Float64Array(1024);
  private e: Float64Array | null = null;
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
    const l = new Int32Array(cap);
    l.set(this.lines);
    this.lines = l;
  }

  /** Add a point; `esd` NaN means "not given". */
  push(x: number, y: number, esd: number, line: number): void {
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
  }

  /** Line of point i (1-based), or undefined. */
  lineOf(i: number): number | undefined {
    return this.lines[i] > 0 ? this.lines[i] : undefined;
  }

  /**
   * Check the scan invariants and build the {@link Scan}: enough points, 2θ finite in (0, 180) and strictly
   * increasing, counts finite and ≥ 0, esd (when given for every point) finite and ≥ 0.
   */
  finish(meta: ScanMeta, fields: { x: string; y: string; e: string } = { x: "twoTheta", y: "counts", e: "esd" }): Scan {
    const n = this.length;
    if (n === 0) throw new ScanParseError("EMPTY", "no data points found");
    if (n < this.limits.minPoints) {
      throw new ScanParseError("TOO_FEW_POINTS", `only ${n} data points; at least ${this.limits.minPoints} are needed`);
    }
    const { x, y, e } = this;
    for (let i = 0; i < n; i++) {
      const xi = x[i];
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
      const yi = y[i];
      if (!Number.isFinite(yi)) throw new ScanParseError("NOT_FINITE", `intensity is ${yi}`, { line, field: fields.y });
      if (yi < 0) throw new ScanParseError("NEGATIVE_COUNTS", `negative intensity ${yi}`, { line, field: fields.y });
    }
    let esd: Float64Array | undefined;
    if (e) {
      for (let i = 0; i < n; i++) {
        const ei = e[i];
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
    return { twoTheta: x.slice(0, n), counts: y.slice(0, n), ...(esd ? { esd } : {}), meta };
  }
}

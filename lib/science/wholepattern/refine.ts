/**
 * Refinement of a set of phases against the observed net profile: Levenberg–Marquardt (Levenberg 1944; Marquardt
 * 1963, J. SIAM 11, 431, with its diagonal scaling) over the non-linear parameters — common zero shift, specimen
 * displacement and pseudo-Voigt η, and per phase the cell scale, width factor and March–Dollase r — while the
 * linear ones (phase scales, background correction) are solved exactly at every step by non-negative least
 * squares: a separable ("variable projection") least-squares problem with Kaufman's (1975, BIT 15, 49) Jacobian.
 * Written here rather than with ml-levenberg-marquardt because that package builds a dense Jacobian element by
 * element and cannot project out the non-negative linear scales; for a 4,000-point, 4-phase scan a step would cost
 * tens of milliseconds instead of about one.
 */
import { Matrix, solve } from "ml-matrix";
import { emptyRender, renderPhaseWithDerivatives, type PhaseRender } from "./derivatives";
import { gramInverse, gramSystem, mirroredColumn, nnlsFromGram, type ProductCache } from "./nnls";
import type { PhaseLines } from "./phase-lines";
import type { GlobalProfile, PhaseProfileParams } from "./types";

/** A phase in a fit, with what may be refined. */
export interface FitPhase {
  lines: PhaseLines;
  params: PhaseProfileParams;
}

/** The data a fit runs against. */
export interface FitData {
  x: Float64Array;
  /** Observed minus background, counts. */
  y: Float64Array;
  /** Weights 1/σ². */
  w: Float64Array;
  /** Background-correction columns (each is used with both signs). */
  background: readonly Float64Array[];
  /** The same columns as NNLS sees them: [+b₀, −b₀, +b₁, −b₁, …]. */
  backgroundPairs: readonly Float64Array[];
  /** Products among the background columns and with y, computed once. */
  cache: ProductCache;
}

/** Fit data with the signed background pairs precomputed. */
export function fitData(x: Float64Array, y: Float64Array, w: Float64Array, background: readonly Float64Array[]): FitData {
  return { x, y, w, background, backgroundPairs: background.flatMap((c) => [c, mirroredColumn(c)]), cache: { stable: new Set(background), products: new Map(), yty: -1 } };
}

/** A fit evaluated at one set of non-linear parameters. */
export interface FitEvaluation {
  phases: FitPhase[];
  global: GlobalProfile;
  renders: PhaseRender[];
  /** Scale of each phase. */
  scales: Float64Array;
  /** Signed coefficient of each background column. */
  backgroundCoef: Float64Array;
  /** Calculated net profile (phases + background correction). */
  calc: Float64Array;
  chi2: number;
}

export interface RefineOptions {
  maxIterations?: number;
  /** Refine the common zero shift. @default true */
  zeroShift?: boolean;
  /**
   * Refine the specimen displacement. Off by default: over a typical range cosθ changes little, so with per-phase
   * cell scales it is nearly collinear with the zero shift. @default false
   */
  displacement?: boolean;
  /** Refine η. @default true */
  eta?: boolean;
  /** Limits of the cell scale. @default [0.985, 1.015] */
  cellLimits?: [number, number];
  /**
   * Refine only this phase (its cell, width and texture, with every scale): the other phases keep the profiles of
   * `frozen` and the global parameters stay fixed. For trying a look-alike in one phase's place cheaply.
   */
  only?: number | null;
  frozen?: FitEvaluation;
}

/** Bounds of the refined quantities (common practice for a qualitative/semi-quantitative fit). */
const ZERO_LIMIT = 0.5;
const DISP_LIMIT = 0.5;
const WIDTH_LIMITS: [number, number] = [0.5, 4];
const MARCH_LIMITS: [number, number] = [0.3, 1.3];

/** Evaluate the fit: render every phase, then solve the non-negative scales and background correction. */
export function evaluateFit(
  data: FitData,
  phases: FitPhase[],
  global: GlobalProfile,
  reuse?: PhaseRender[],
  frozen?: { renders: PhaseRender[]; except: number },
  withDisplacement = false,
): FitEvaluation {
  const n = data.x.length;
  const renders = phases.map((ph, k) => {
    if (frozen && k !== frozen.except) return frozen.renders[k];
    const r = reuse?.[k] ?? emptyRender(n, ph.lines.cosAlpha !== null);
    if (r.dLnR === null && ph.lines.cosAlpha !== null) return emptyRender(n, true);
    renderPhaseWithDerivatives(data.x, ph.lines, global, ph.params, r, withDisplacement);
    return r;
  });
  return solveLinear(data, phases, global, renders);
}

/** Non-negative scales and signed background terms for fixed renders. */
export function solveLinear(data: FitData, phases: FitPhase[], global: GlobalProfile, renders: PhaseRender[]): FitEvaluation {
  const n = data.x.length;
  const m = phases.length;
  const cols: Float64Array[] = [...renders.map((r) => r.value), ...data.backgroundPairs];
  const { G, b, yty } = gramSystem(cols, data.y, data.w, data.cache);
  const all = cols.map((_, i) => i);
  const sol = nnlsFromGram(G, cols.length, b, yty, all);
  const scales = sol.x.slice(0, m);
  const backgroundCoef = new Float64Array(data.background.length);
  for (let k = 0; k < data.background.length; k++) backgroundCoef[k] = sol.x[m + 2 * k] - sol.x[m + 2 * k + 1];
  const calc = new Float64Array(n);
  for (let k = 0; k < m; k++) {
    const s = scales[k];
    if (s === 0) continue;
    const v = renders[k].value;
    const [lo, hi] = renders[k].span;
    for (let i = lo; i <= hi; i++) calc[i] += s * v[i];
  }
  data.background.forEach((col, k) => {
    const c = backgroundCoef[k];
    if (c !== 0) for (let i = 0; i < n; i++) calc[i] += c * col[i];
  });
  let chi2 = 0;
  for (let i = 0; i < n; i++) {
    const r = data.y[i] - calc[i];
    chi2 += data.w[i] * r * r;
  }
  return { phases, global, renders, scales, backgroundCoef, calc, chi2 };
}

interface Param {
  get: (ph: FitPhase[], g: GlobalProfile) => number;
  set: (ph: FitPhase[], g: GlobalProfile, v: number) => void;
  lo: number;
  hi: number;
  /** Jacobian column of the model (Kaufman: scales held fixed). */
  jac: (ev: FitEvaluation, out: Float64Array) => void;
}

function clonePhases(ph: FitPhase[]): FitPhase[] {
  return ph.map((p) => ({ lines: p.lines, params: { ...p.params } }));
}

function sumScaled(ev: FitEvaluation, pick: (r: PhaseRender) => Float64Array | null, out: Float64Array, only?: number): void {
  out.fill(0);
  ev.renders.forEach((r, k) => {
    if (only !== undefined && k !== only) return;
    const s = ev.scales[k];
    const v = pick(r);
    if (!v || s === 0) return;
    for (let i = r.span[0]; i <= r.span[1]; i++) out[i] += s * v[i];
  });
}

function parameters(phases: FitPhase[], opts: Required<RefineOptions>): Param[] {
  const out: Param[] = [];
  const only = opts.only;
  if (opts.zeroShift)
    out.push({ get: (_, g) => g.zeroShift, set: (_, g, v) => (g.zeroShift = v), lo: -ZERO_LIMIT, hi: ZERO_LIMIT, jac: (ev, o) => sumScaled(ev, (r) => r.dZero, o) });
  if (opts.displacement)
    out.push({ get: (_, g) => g.displacementMm, set: (_, g, v) => (g.displacementMm = v), lo: -DISP_LIMIT, hi: DISP_LIMIT, jac: (ev, o) => sumScaled(ev, (r) => r.dDisp, o) });
  if (opts.eta) out.push({ get: (_, g) => g.eta, set: (_, g, v) => (g.eta = v), lo: 0, hi: 1, jac: (ev, o) => sumScaled(ev, (r) => r.dEta, o) });
  phases.forEach((ph, k) => {
    if (only !== null && k !== only) return;
    out.push({
      get: (p) => p[k].params.cellScale,
      set: (p, _, v) => (p[k].params.cellScale = v),
      lo: opts.cellLimits[0],
      hi: opts.cellLimits[1],
      jac: (ev, o) => sumScaled(ev, (r) => r.dCell, o, k),
    });
    out.push({
      get: (p) => Math.log(p[k].params.widthFactor),
      set: (p, _, v) => (p[k].params.widthFactor = Math.exp(v)),
      lo: Math.log(WIDTH_LIMITS[0]),
      // A crystalline phase may broaden to a few times the instrument width (size, strain), more only where the
      // library says it never gives sharp lines (clays): otherwise a phase could be stretched over an amorphous hump.
      hi: Math.log(Math.max(WIDTH_LIMITS[1], 2 * (ph.lines.ref.broadening ?? 1))),
      jac: (ev, o) => sumScaled(ev, (r) => r.dLnWidth, o, k),
    });
    if (ph.lines.cosAlpha !== null && ph.params.marchR !== null)
      out.push({
        get: (p) => Math.log(p[k].params.marchR ?? 1),
        set: (p, _, v) => (p[k].params.marchR = Math.exp(v)),
        lo: Math.log(MARCH_LIMITS[0]),
        hi: Math.log(MARCH_LIMITS[1]),
        jac: (ev, o) => sumScaled(ev, (r) => r.dLnR, o, k),
      });
  });
  return out;
}

/**
 * Refine the non-linear parameters of a set of phases. Returns the best evaluation reached (never worse than the
 * start).
 */
export function refineFit(data: FitData, start: FitPhase[], global: GlobalProfile, options: RefineOptions = {}): FitEvaluation & { iterations: number } {
  const opts: Required<RefineOptions> = {
    maxIterations: options.maxIterations ?? 25,
    only: options.only ?? null,
    frozen: options.frozen ?? (undefined as unknown as FitEvaluation),
    zeroShift: options.zeroShift ?? true,
    displacement: options.displacement ?? false,
    eta: options.eta ?? true,
    cellLimits: options.cellLimits ?? [0.985, 1.015],
  };
  const n = data.x.length;
  const only = opts.only;
  if (only !== null) {
    if (!options.frozen) throw new RangeError("refining one phase needs the frozen profiles of the others");
    opts.zeroShift = false;
    opts.displacement = false;
    opts.eta = false;
  }
  const frozen = only !== null ? { renders: options.frozen!.renders, except: only } : undefined;
  let cur = evaluateFit(data, clonePhases(start), { ...global }, undefined, frozen, opts.displacement);
  if (start.length === 0) return { ...cur, iterations: 0 };
  let lambda = 1e-3;
  let it = 0;
  let spare: PhaseRender[] | undefined;
  for (; it < opts.maxIterations; it++) {
    const params = parameters(cur.phases, opts);
    const P = params.length;
    const J = params.map(() => new Float64Array(n));
    params.forEach((p, k) => p.jac(cur, J[k]));
    const A = new Matrix(P, P);
    const gvec = new Matrix(P, 1);
    for (let a = 0; a < P; a++) {
      const ja = J[a];
      let s = 0;
      for (let i = 0; i < n; i++) if (ja[i] !== 0) s += data.w[i] * ja[i] * (data.y[i] - cur.calc[i]);
      gvec.set(a, 0, s);
      for (let b = a; b < P; b++) {
        const jb = J[b];
        let t = 0;
        for (let i = 0; i < n; i++) if (ja[i] !== 0) t += data.w[i] * ja[i] * jb[i];
        A.set(a, b, t);
        A.set(b, a, t);
      }
    }
    let accepted = false;
    for (let tries = 0; tries < 8 && !accepted; tries++) {
      const M = A.clone();
      for (let a = 0; a < P; a++) M.set(a, a, A.get(a, a) * (1 + lambda) + 1e-12);
      let delta: number[];
      try {
        delta = solve(M, gvec).to1DArray();
      } catch {
        lambda *= 10;
        continue;
      }
      const phases = clonePhases(cur.phases);
      const g = { ...cur.global };
      params.forEach((p, k) => {
        const v = p.get(phases, g) + delta[k];
        p.set(phases, g, Math.min(p.hi, Math.max(p.lo, Number.isFinite(v) ? v : p.get(phases, g))));
      });
      const trial = evaluateFit(data, phases, g, spare, frozen, opts.displacement);
      if (trial.chi2 < cur.chi2) {
        // Improvement in units of the reduced χ²: below one unit the change means nothing statistically.
        const gain = (cur.chi2 - trial.chi2) / Math.max(cur.chi2 / Math.max(1, n - P), 1e-300);
        spare = cur.renders;
        cur = trial;
        lambda = Math.max(lambda / 4, 1e-7);
        accepted = true;
        if (gain < 1) it = opts.maxIterations;
      } else {
        spare = trial.renders;
        lambda *= 6;
      }
    }
    if (!accepted) break;
  }
  return { ...cur, iterations: it };
}

/**
 * Standard uncertainties of the phase scales at the final parameters: (AᵀWA)⁻¹ scaled by the reduced χ²
 * (the usual Rietveld convention; Prince 1981), conditional on the non-linear parameters.
 * @returns σ per phase (NaN where the matrix is singular)
 */
export function scaleSigmas(data: FitData, ev: FitEvaluation, parameters: number): Float64Array {
  const m = ev.phases.length;
  const out = new Float64Array(m).fill(NaN);
  const active = [...Array(m).keys()].filter((k) => ev.scales[k] > 0);
  if (active.length === 0) return out;
  const cols = active.map((k) => ev.renders[k].value);
  const { G } = gramSystem(cols, data.y, data.w);
  const inv = gramInverse(G, cols.length, cols.map((_, i) => i));
  if (!inv) return out;
  const dof = Math.max(1, data.x.length - parameters);
  const gof = ev.chi2 / dof;
  active.forEach((k, i) => (out[k] = Math.sqrt(Math.max(0, inv.get(i, i)) * gof)));
  return out;
}

"use client";

import "uplot/dist/uPlot.min.css";
import { useEffect, useMemo, useRef, useState } from "react";
import type uPlot from "uplot";
import { cn } from "@/lib/utils";

/** Reference lines of a candidate drawn over the pattern; heights in counts above the background. */
export interface Overlay {
  id: string;
  label: string;
  color: string;
  lines: { twoTheta: number; height: number }[];
}

/** One phase's own contribution drawn on the fit's background (null where the phase contributes nothing). */
export interface PhaseCurve {
  id: string;
  label: string;
  color: string;
  values: (number | null)[];
}

export interface DiffractogramProps {
  twoTheta: number[];
  raw: number[];
  background: number[];
  /** Background + Kα1-only processed signal. */
  processed: number[];
  /** Background + the peak list's own fitted peaks. */
  fitted: number[];
  /** Whole-pattern fit: background + every phase. */
  calculated?: number[];
  /** Observed − calculated, drawn in its own panel under the pattern. */
  difference?: number[];
  /** Each fitted phase's contribution (toggle per phase). */
  phases?: PhaseCurve[];
  peaks: { twoTheta: number; height: number }[];
  /** Å, for the d axis and read-outs. */
  wavelength: number;
  overlays?: Overlay[];
  height?: number;
  className?: string;
}

interface SeriesDef {
  key: string;
  label: string;
  color: string;
  width: number;
  dash?: number[];
  values: (number | null)[];
}

const OBSERVED_COLOR = "#3d4a4c";
const CALCULATED_COLOR = "#c2410c";
const DIFFERENCE_COLOR = "#1d5c63";

const DEG = Math.PI / 180;
const dOf = (tt: number, lambda: number) => lambda / (2 * Math.sin((tt / 2) * DEG));
const ttOf = (d: number, lambda: number) => (2 * Math.asin(lambda / (2 * d))) / DEG;

/** Nice d values (Å) for a d axis: 1–2–2.5–5 steps from 0.5 to 50 Å, plus the usual intermediate values. */
const D_LADDER = (() => {
  const out: number[] = [];
  for (const decade of [0.1, 1, 10]) for (const m of [1, 1.1, 1.2, 1.25, 1.3, 1.4, 1.5, 1.6, 1.8, 2, 2.2, 2.5, 3, 3.5, 4, 4.5, 5, 6, 7, 8, 9]) out.push(+(m * decade).toFixed(3));
  out.push(100);
  return out.sort((a, b) => b - a);
})();

/** 2θ positions of d ticks at least `minPx` apart on the current scale. */
function dSplits(u: uPlot, min: number, max: number, lambda: number, minPx = 46): number[] {
  const out: number[] = [];
  let lastPx = -Infinity;
  for (const d of D_LADDER) {
    if (lambda / (2 * d) >= 1) continue;
    const tt = ttOf(d, lambda);
    if (tt < min || tt > max) continue;
    const px = u.valToPos(tt, "x");
    if (px - lastPx >= minPx) {
      out.push(tt);
      lastPx = px;
    }
  }
  return out;
}

function interp(xs: number[], ys: number[], x: number): number {
  let lo = 0;
  let hi = xs.length - 1;
  if (x <= xs[0]) return ys[0];
  if (x >= xs[hi]) return ys[hi];
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (xs[mid] <= x) lo = mid;
    else hi = mid;
  }
  const t = (x - xs[lo]) / (xs[hi] - xs[lo]);
  return ys[lo] + t * (ys[hi] - ys[lo]);
}

/**
 * Interactive diffractogram (uPlot, canvas; client only): observed counts, background, processed profile and the
 * peak fit; with a whole-pattern fit, its calculated profile, each phase's own profile (toggle per phase) and the
 * difference (observed − calculated) in a panel underneath that follows the zoom; peak marks and candidate
 * reference lines. Drag to zoom, wheel to zoom at the pointer, buttons or arrow
 * keys to pan, double-click or "Reset" to show everything; 2θ or d axis; linear or log counts.
 */
export function Diffractogram({ twoTheta, raw, background, processed, fitted, calculated, difference, phases = [], peaks, wavelength, overlays = [], height = 360, className }: DiffractogramProps) {
  const wrapRef = useRef<HTMLDivElement>(null);
  const diffRef = useRef<HTMLDivElement>(null);
  const plotRef = useRef<uPlot | null>(null);
  const diffPlotRef = useRef<uPlot | null>(null);
  const [axis, setAxis] = useState<"2theta" | "d">("2theta");
  const [log, setLog] = useState(false);
  const hasFit = !!calculated && calculated.length === twoTheta.length;
  const hasDiff = hasFit && !!difference && difference.length === twoTheta.length;
  const [shown, setShown] = useState<Record<string, boolean>>({});
  const isShown = (key: string) => shown[key] ?? !(key === "processed" || (key === "fitted" && hasFit));
  const [ready, setReady] = useState(false);
  const [readout, setReadout] = useState<number | null>(null);
  const mainHeight = hasDiff && isShown("difference") ? Math.round(height * 0.74) : height;
  const diffHeight = height - Math.round(height * 0.74) + 44;
  const series: SeriesDef[] = useMemo(
    // Drawn in this order: phase profiles underneath, then the curves, the observed counts and, on top, the calculated
    // profile (thin, so the observed line shows through where they agree).
    () => [
      ...phases.map((p) => ({ key: `phase:${p.id}`, label: p.label, color: p.color, width: 1.25, values: p.values })),
      { key: "background", label: "Background", color: "#a08a5b", width: 1.25, dash: [6, 4], values: background },
      { key: "processed", label: "Processed (Kα1)", color: "#1d5c63", width: 1.25, values: processed },
      { key: "fitted", label: hasFit ? "Peak fit" : "Fitted profile", color: "rgba(120, 90, 160, 0.85)", width: 1.25, values: fitted },
      { key: "raw", label: "Observed", color: OBSERVED_COLOR, width: hasFit ? 1.5 : 1, values: raw },
      ...(hasFit ? [{ key: "calculated", label: "Calculated (fit)", color: CALCULATED_COLOR, width: 1, values: calculated! }] : []),
    ],
    [raw, background, processed, fitted, hasFit, calculated, phases],
  );
  // Shaded area of each shown phase between its profile and the background (painted under the curves).
  const fills = useMemo(() => phases.map((p) => ({ color: p.color, values: p.values, show: shown[`phase:${p.id}`] ?? true })), [phases, shown]);
  const drawState = useRef({ peaks, overlays, showPeaks: isShown("peaks"), twoTheta, background, fitted: hasFit ? calculated! : fitted, log, fills });
  // What the draw hooks paint under and on top of the curves (phase areas, peak marks, reference lines); a redraw picks it up.
  const showPeaks = isShown("peaks");
  useEffect(() => {
    drawState.current = { peaks, overlays, showPeaks, twoTheta, background, fitted: hasFit ? calculated! : fitted, log, fills };
    plotRef.current?.redraw(false);
  }, [peaks, overlays, showPeaks, twoTheta, background, fitted, calculated, hasFit, log, fills]);

  const data = useMemo(() => {
    const clamp = (a: (number | null)[]) => (log ? a.map((v) => (v == null ? null : Math.max(v, 1))) : a);
    return [twoTheta, ...series.map((s) => clamp(s.values))] as uPlot.AlignedData;
  }, [twoTheta, series, log]);

  const diffData = useMemo(() => (hasDiff ? ([twoTheta, difference!] as uPlot.AlignedData) : null), [hasDiff, twoTheta, difference]);
  const showDiff = hasDiff && isShown("difference");

  // (Re)create the plots when the data or the axis kinds change.
  useEffect(() => {
    let disposed = false;
    let plot: uPlot | null = null;
    let diffPlot: uPlot | null = null;
    const el = wrapRef.current;
    if (!el || twoTheta.length < 2) return;
    const keepX = plotRef.current ? { min: plotRef.current.scales.x.min, max: plotRef.current.scales.x.max } : null;
    const syncKey = `diffractogram-${Math.random().toString(36).slice(2)}`;
    void import("uplot").then(({ default: UPlot }) => {
      if (disposed || !wrapRef.current) return;
      const width = Math.max(280, wrapRef.current.clientWidth);
      const xAxis = (showValues: boolean): uPlot.Axis => ({
        label: showValues ? (axis === "d" ? "d (Å)" : "2θ (°)") : undefined,
        labelSize: showValues ? 24 : 0,
        size: showValues ? 36 : 6,
        stroke: "#5f6b6d",
        grid: { stroke: "#ece8df", width: 1 },
        ...(axis === "d" ? { splits: (u: uPlot, _i: number, min: number, max: number) => dSplits(u, min, max, wavelength) } : {}),
        values: (_u: uPlot, splits: number[]) =>
          splits.map((tt) => {
            if (!showValues) return "";
            if (axis !== "d") return String(Math.round(tt * 100) / 100);
            const d = dOf(tt, wavelength);
            return d >= 10 ? d.toFixed(0) : d >= 2 ? d.toFixed(1) : d.toFixed(2);
          }),
      });
      // Zoom and pan of either plot follow the other.
      const follow = (other: () => uPlot | null) => (u: uPlot, key: string) => {
        const o = other();
        if (key !== "x" || !o) return;
        const { min, max } = u.scales.x;
        if (min == null || max == null || (o.scales.x.min === min && o.scales.x.max === max)) return;
        o.setScale("x", { min, max });
      };
      const opts: uPlot.Options = {
        width,
        height: mainHeight,
        pxAlign: 0,
        legend: { show: false },
        cursor: { drag: { x: true, y: false, setScale: true }, points: { show: false }, sync: { key: syncKey } },
        scales: { x: { time: false }, y: log ? { distr: 3, log: 10 } : { auto: true } },
        series: [
          {
            label: "2θ",
            value: (_u, v) => (v == null ? "—" : `${v.toFixed(3)}° · d ${dOf(v, wavelength).toFixed(4)} Å`),
          },
          ...series.map((s) => ({ label: s.label, stroke: s.color, width: s.width, dash: s.dash, show: isShown(s.key), value: (_u: uPlot, v: number | null) => (v == null ? "—" : Math.round(v).toLocaleString("en")) })),
        ],
        axes: [xAxis(!showDiff), { label: log ? "Counts (log)" : "Counts", labelSize: 24, stroke: "#5f6b6d", grid: { stroke: "#ece8df", width: 1 }, size: 64 }],
        hooks: {
          setCursor: [(u) => setReadout(u.cursor.idx ?? null)],
          setScale: [follow(() => diffPlotRef.current)],
          // Before the series: each phase's contribution as a translucent area above the background.
          drawAxes: [
            (u) => {
              const st = drawState.current;
              if (!st.fills.some((f) => f.show)) return;
              const ctx = u.ctx;
              const { left, top, width: w, height: h } = u.bbox;
              const xMin = u.scales.x.min ?? -Infinity;
              const xMax = u.scales.x.max ?? Infinity;
              const yMin = u.scales.y.min ?? 0;
              const yPos = (v: number) => u.valToPos(st.log ? Math.max(v, Math.max(yMin, 1)) : v, "y", true);
              const xs = st.twoTheta;
              ctx.save();
              ctx.beginPath();
              ctx.rect(left, top, w, h);
              ctx.clip();
              ctx.globalAlpha = 0.28;
              for (const f of st.fills) {
                if (!f.show) continue;
                ctx.fillStyle = f.color;
                let i = 0;
                while (i < xs.length) {
                  if (f.values[i] == null || xs[i] < xMin) {
                    i++;
                    continue;
                  }
                  if (xs[i] > xMax) break;
                  const start = i;
                  while (i < xs.length && f.values[i] != null && xs[i] <= xMax) i++;
                  ctx.beginPath();
                  for (let k = start; k < i; k++) ctx.lineTo(u.valToPos(xs[k], "x", true), yPos(f.values[k]!));
                  for (let k = i - 1; k >= start; k--) ctx.lineTo(u.valToPos(xs[k], "x", true), yPos(st.background[k]));
                  ctx.closePath();
                  ctx.fill();
                }
              }
              ctx.restore();
            },
          ],
          draw: [
            (u) => {
              const st = drawState.current;
              const ctx = u.ctx;
              const { left, top, width: w, height: h } = u.bbox;
              const xMin = u.scales.x.min ?? -Infinity;
              const xMax = u.scales.x.max ?? Infinity;
              const yMin = u.scales.y.min ?? 0;
              ctx.save();
              ctx.beginPath();
              ctx.rect(left, top, w, h);
              ctx.clip();
              const yPos = (v: number) => u.valToPos(st.log ? Math.max(v, Math.max(yMin, 1)) : v, "y", true);
              for (const ov of st.overlays) {
                ctx.strokeStyle = ov.color;
                ctx.lineWidth = 2 * devicePixelRatio;
                ctx.globalAlpha = 0.85;
                for (const line of ov.lines) {
                  if (line.twoTheta < xMin || line.twoTheta > xMax) continue;
                  const x = u.valToPos(line.twoTheta, "x", true);
                  const base = interp(st.twoTheta, st.background, line.twoTheta);
                  ctx.beginPath();
                  ctx.moveTo(x, yPos(base));
                  ctx.lineTo(x, yPos(base + Math.max(line.height, 0)));
                  ctx.stroke();
                }
              }
              ctx.globalAlpha = 1;
              if (st.showPeaks) {
                ctx.fillStyle = "#17313a";
                const s = 4 * devicePixelRatio;
                for (const p of st.peaks) {
                  if (p.twoTheta < xMin || p.twoTheta > xMax) continue;
                  const x = u.valToPos(p.twoTheta, "x", true);
                  // Above the fitted profile at the peak (it includes the Kα2 companion, unlike the Kα1 height).
                  const top = yPos(Math.max(interp(st.twoTheta, st.fitted, p.twoTheta), interp(st.twoTheta, st.background, p.twoTheta) + p.height)) - 6 * devicePixelRatio;
                  ctx.beginPath();
                  ctx.moveTo(x, top);
                  ctx.lineTo(x - s, top - 1.6 * s);
                  ctx.lineTo(x + s, top - 1.6 * s);
                  ctx.closePath();
                  ctx.fill();
                }
              }
              ctx.restore();
            },
          ],
        },
      };
      plot = new UPlot(opts, data, wrapRef.current);
      if (showDiff && diffData && diffRef.current) {
        const diffOpts: uPlot.Options = {
          width,
          height: diffHeight,
          pxAlign: 0,
          legend: { show: false },
          cursor: { drag: { x: true, y: false, setScale: true }, points: { show: false }, sync: { key: syncKey } },
          scales: {
            x: { time: false },
            y: {
              range: (_u, min, max) => {
                const a = Math.max(Math.abs(min ?? 0), Math.abs(max ?? 0), 1) * 1.05;
                return [-a, a];
              },
            },
          },
          series: [{ label: "2θ" }, { label: "Observed − calculated", stroke: DIFFERENCE_COLOR, width: 1 }],
          axes: [xAxis(true), { label: "Obs − calc", labelSize: 20, labelFont: "11px system-ui, sans-serif", stroke: "#5f6b6d", grid: { stroke: "#ece8df", width: 1 }, size: 64, ticks: { show: true }, splits: (_u, _i, min, max) => [min * 0.8, 0, max * 0.8].map((v) => Math.round(v)) }],
          hooks: {
            setCursor: [(u) => setReadout(u.cursor.idx ?? null)],
            setScale: [follow(() => plotRef.current)],
            draw: [
              (u) => {
                const ctx = u.ctx;
                const y0 = u.valToPos(0, "y", true);
                ctx.save();
                ctx.strokeStyle = "#a08a5b";
                ctx.lineWidth = devicePixelRatio;
                ctx.setLineDash([4 * devicePixelRatio, 3 * devicePixelRatio]);
                ctx.beginPath();
                ctx.moveTo(u.bbox.left, y0);
                ctx.lineTo(u.bbox.left + u.bbox.width, y0);
                ctx.stroke();
                ctx.restore();
              },
            ],
          },
        };
        diffPlot = new UPlot(diffOpts, diffData, diffRef.current);
        diffPlotRef.current = diffPlot;
      }
      plotRef.current = plot;
      if (keepX && keepX.min != null && keepX.max != null) plot.setScale("x", { min: keepX.min, max: keepX.max });
      setReady(true);
    });
    return () => {
      disposed = true;
      plot?.destroy();
      diffPlot?.destroy();
      if (plotRef.current === plot) plotRef.current = null;
      if (diffPlotRef.current === diffPlot) diffPlotRef.current = null;
    };
    // Series visibility is applied below without rebuilding; overlays/peaks redraw through drawState.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [data, diffData, showDiff, axis, log, mainHeight, diffHeight, wavelength]);

  // Series visibility without rebuilding.
  useEffect(() => {
    const u = plotRef.current;
    if (!u) return;
    series.forEach((s, i) => u.setSeries(i + 1, { show: isShown(s.key) }));
    u.redraw(false);
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [shown, ready, series]);

  // Follow the container width.
  useEffect(() => {
    const el = wrapRef.current;
    if (!el) return;
    const ro = new ResizeObserver(() => {
      if (el.clientWidth <= 0) return;
      const width = Math.max(280, el.clientWidth);
      plotRef.current?.setSize({ width, height: mainHeight });
      diffPlotRef.current?.setSize({ width, height: diffHeight });
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, [mainHeight, diffHeight]);

  const full = useMemo(() => ({ min: twoTheta[0], max: twoTheta[twoTheta.length - 1] }), [twoTheta]);

  const zoom = (factor: number, centre?: number) => {
    const u = plotRef.current;
    if (!u) return;
    const min = u.scales.x.min ?? full.min;
    const max = u.scales.x.max ?? full.max;
    const c = centre ?? (min + max) / 2;
    const span = Math.min(full.max - full.min, Math.max(0.2, (max - min) * factor));
    let lo = c - (c - min) * (span / (max - min));
    let hi = lo + span;
    if (lo < full.min) [lo, hi] = [full.min, full.min + span];
    if (hi > full.max) [lo, hi] = [full.max - span, full.max];
    u.setScale("x", { min: lo, max: hi });
  };
  const pan = (fraction: number) => {
    const u = plotRef.current;
    if (!u) return;
    const min = u.scales.x.min ?? full.min;
    const max = u.scales.x.max ?? full.max;
    const shift = Math.max(full.min - min, Math.min(full.max - max, (max - min) * fraction));
    u.setScale("x", { min: min + shift, max: max + shift });
  };
  const reset = () => plotRef.current?.setScale("x", full);

  // Wheel zoom at the pointer (only over the plot area, so the page still scrolls elsewhere).
  useEffect(() => {
    const el = wrapRef.current;
    if (!el) return;
    const onWheel = (e: WheelEvent) => {
      const u = plotRef.current;
      if (!u || !(e.target instanceof HTMLElement) || !e.target.closest(".u-over")) return;
      e.preventDefault();
      const rect = u.over.getBoundingClientRect();
      zoom(e.deltaY > 0 ? 1.25 : 0.8, u.posToVal(e.clientX - rect.left, "x"));
    };
    el.addEventListener("wheel", onWheel, { passive: false });
    return () => el.removeEventListener("wheel", onWheel);
  });

  const onKey = (e: React.KeyboardEvent) => {
    if (e.key === "ArrowLeft") pan(-0.25);
    else if (e.key === "ArrowRight") pan(0.25);
    else if (e.key === "+" || e.key === "=") zoom(0.7);
    else if (e.key === "-") zoom(1 / 0.7);
    else if (e.key === "0" || e.key === "Escape") reset();
    else return;
    e.preventDefault();
  };

  const toggle = (k: string) => setShown((s) => ({ ...s, [k]: !isShown(k) }));
  const btn = "rounded border border-line bg-white px-2 py-1 text-xs font-medium text-ink hover:bg-stone aria-pressed:border-brand aria-pressed:bg-brand-light";

  return (
    <div className={cn("space-y-2", className)}>
      <div className="flex flex-wrap items-center gap-2" role="toolbar" aria-label="Diffractogram controls">
        <div className="flex gap-1" role="group" aria-label="Horizontal axis">
          <button type="button" className={btn} aria-pressed={axis === "2theta"} onClick={() => setAxis("2theta")}>
            2θ
          </button>
          <button type="button" className={btn} aria-pressed={axis === "d"} onClick={() => setAxis("d")}>
            d
          </button>
        </div>
        <div className="flex gap-1" role="group" aria-label="Counts scale">
          <button type="button" className={btn} aria-pressed={!log} onClick={() => setLog(false)}>
            Linear
          </button>
          <button type="button" className={btn} aria-pressed={log} onClick={() => setLog(true)}>
            Log
          </button>
        </div>
        <div className="flex gap-1" role="group" aria-label="Zoom and pan">
          <button type="button" className={btn} onClick={() => pan(-0.25)} aria-label="Pan left">
            ◀
          </button>
          <button type="button" className={btn} onClick={() => zoom(0.7)} aria-label="Zoom in">
            +
          </button>
          <button type="button" className={btn} onClick={() => zoom(1 / 0.7)} aria-label="Zoom out">
            −
          </button>
          <button type="button" className={btn} onClick={() => pan(0.25)} aria-label="Pan right">
            ▶
          </button>
          <button type="button" className={btn} onClick={reset}>
            Reset
          </button>
        </div>
        <div className="flex flex-wrap gap-1" role="group" aria-label="Curves shown">
          {series
            .filter((s) => !s.key.startsWith("phase:"))
            .sort((a, b) => Number(b.key === "raw") - Number(a.key === "raw"))
            .map((s) => (
              <button key={s.key} type="button" className={btn} aria-pressed={isShown(s.key)} onClick={() => toggle(s.key)}>
                <span aria-hidden className="mr-1 inline-block h-0.5 w-3 align-middle" style={{ background: s.color }} />
                {s.label}
              </button>
            ))}
          {hasDiff && (
            <button type="button" className={btn} aria-pressed={isShown("difference")} onClick={() => toggle("difference")}>
              <span aria-hidden className="mr-1 inline-block h-0.5 w-3 align-middle" style={{ background: DIFFERENCE_COLOR }} />
              Difference
            </button>
          )}
          <button type="button" className={btn} aria-pressed={isShown("peaks")} onClick={() => toggle("peaks")}>
            ▼ Peaks
          </button>
        </div>
      </div>
      {phases.length > 0 && (
        <div className="flex flex-wrap items-center gap-1" role="group" aria-label="Phase profiles shown">
          <span className="mr-1 text-xs text-muted">Phase profiles:</span>
          {phases.map((p) => (
            <button key={p.id} type="button" className={btn} aria-pressed={isShown(`phase:${p.id}`)} onClick={() => toggle(`phase:${p.id}`)} data-testid="phase-profile-toggle">
              <span aria-hidden className="mr-1 inline-block h-1 w-3 align-middle" style={{ background: p.color }} />
              {p.label}
            </button>
          ))}
        </div>
      )}
      {overlays.length > 0 && (
        <ul className="flex flex-wrap gap-3 text-xs" aria-label="Reference lines shown">
          {overlays.map((o) => (
            <li key={o.id} className="flex items-center gap-1">
              <span aria-hidden className="inline-block h-3 w-1" style={{ background: o.color }} />
              {o.label}
            </li>
          ))}
        </ul>
      )}
      <div className="overflow-hidden rounded-md border border-line bg-white">
        <div
          ref={wrapRef}
          tabIndex={0}
          onKeyDown={onKey}
          onDoubleClick={reset}
          role="img"
          aria-label={`Diffractogram, ${twoTheta.length} points from ${full.min.toFixed(2)} to ${full.max.toFixed(2)}° 2θ, ${peaks.length} peaks marked${hasFit ? `, with the calculated profile of the whole-pattern fit${phases.length ? ` and ${phases.length} phase profile${phases.length === 1 ? "" : "s"}` : ""}` : ""}`}
          data-testid="diffractogram"
          className="w-full focus-visible:outline-2"
          style={{ minHeight: mainHeight + 10 }}
        />
        {showDiff && (
          <div
            ref={diffRef}
            role="img"
            aria-label="Difference between the observed and calculated profiles (observed − calculated), on the same 2θ scale"
            data-testid="difference-plot"
            className="w-full border-t border-line/70"
            style={{ minHeight: diffHeight }}
            onDoubleClick={reset}
          />
        )}
      </div>
      <p className="min-h-5 text-xs tabular-nums" aria-live="off" data-testid="readout">
        {readout != null && twoTheta[readout] != null ? (
          <>
            2θ <span className="font-medium">{twoTheta[readout].toFixed(3)}°</span> · d <span className="font-medium">{dOf(twoTheta[readout], wavelength).toFixed(4)} Å</span> · observed{" "}
            <span className="font-medium">{Math.round(raw[readout]).toLocaleString("en")}</span> · background {Math.round(background[readout]).toLocaleString("en")}
            {hasFit ? (
              <>
                {" "}
                · calculated <span className="font-medium">{Math.round(calculated![readout]).toLocaleString("en")}</span>
                {hasDiff ? ` · difference ${Math.round(difference![readout]).toLocaleString("en")}` : ""} counts
              </>
            ) : (
              <> · fitted {Math.round(fitted[readout]).toLocaleString("en")} counts</>
            )}
          </>
        ) : (
          <span className="text-muted">Point at the plot to read 2θ, d and counts.</span>
        )}
      </p>
      <p className="text-xs text-muted">Drag across the plot to zoom, use the wheel over the plot to zoom at the pointer, arrow keys or ◀ ▶ to pan, double-click or Reset to see the whole scan.</p>
    </div>
  );
}

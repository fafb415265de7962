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

export interface DiffractogramProps {
  twoTheta: number[];
  raw: number[];
  background: number[];
  /** Background + Kα1-only processed signal. */
  processed: number[];
  fitted: number[];
  peaks: { twoTheta: number; height: number }[];
  /** Å, for the d axis and read-outs. */
  wavelength: number;
  overlays?: Overlay[];
  height?: number;
  className?: string;
}

type SeriesKey = "raw" | "background" | "processed" | "fitted";
const SERIES: { key: SeriesKey; label: string; color: string; width: number; dash?: number[] }[] = [
  { key: "raw", label: "Observed", color: "#3d4a4c", width: 1 },
  { key: "background", label: "Background", color: "#a08a5b", width: 1.25, dash: [6, 4] },
  { key: "processed", label: "Processed (Kα1)", color: "#1d5c63", width: 1.25 },
  { key: "fitted", label: "Fitted profile", color: "rgba(200, 80, 20, 0.8)", width: 1.25 },
];

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
 * Interactive diffractogram (uPlot, canvas; client only): observed counts, background, processed and fitted
 * profiles, peak marks and candidate reference lines. Drag to zoom, wheel to zoom at the pointer, buttons or arrow
 * keys to pan, double-click or "Reset" to show everything; 2θ or d axis; linear or log counts.
 */
export function Diffractogram({ twoTheta, raw, background, processed, fitted, peaks, wavelength, overlays = [], height = 360, className }: DiffractogramProps) {
  const wrapRef = useRef<HTMLDivElement>(null);
  const plotRef = useRef<uPlot | null>(null);
  const [axis, setAxis] = useState<"2theta" | "d">("2theta");
  const [log, setLog] = useState(false);
  const [shown, setShown] = useState<Record<SeriesKey | "peaks", boolean>>({ raw: true, background: true, processed: false, fitted: true, peaks: true });
  const [ready, setReady] = useState(false);
  const [readout, setReadout] = useState<number | null>(null);
  const drawState = useRef({ peaks, overlays, showPeaks: shown.peaks, twoTheta, background, fitted, log });
  // What the draw hook paints on top of the curves (peak marks, reference lines); a redraw picks it up.
  useEffect(() => {
    drawState.current = { peaks, overlays, showPeaks: shown.peaks, twoTheta, background, fitted, log };
    plotRef.current?.redraw(false);
  }, [peaks, overlays, shown.peaks, twoTheta, background, fitted, log]);

  const data = useMemo(() => {
    const clamp = (a: number[]) => (log ? a.map((v) => Math.max(v, 1)) : a);
    return [twoTheta, clamp(raw), clamp(background), clamp(processed), clamp(fitted)] as uPlot.AlignedData;
  }, [twoTheta, raw, background, processed, fitted, log]);

  // (Re)create the plot when the data or the axis kinds change.
  useEffect(() => {
    let disposed = false;
    let plot: uPlot | null = null;
    const el = wrapRef.current;
    if (!el || twoTheta.length < 2) return;
    const keepX = plotRef.current ? { min: plotRef.current.scales.x.min, max: plotRef.current.scales.x.max } : null;
    void import("uplot").then(({ default: UPlot }) => {
      if (disposed || !wrapRef.current) return;
      const width = Math.max(280, wrapRef.current.clientWidth);
      const opts: uPlot.Options = {
        width,
        height,
        pxAlign: 0,
        legend: { show: false },
        cursor: { drag: { x: true, y: false, setScale: true }, points: { show: false } },
        scales: { x: { time: false }, y: log ? { distr: 3, log: 10 } : { auto: true } },
        series: [
          {
            label: "2θ",
            value: (_u, v) => (v == null ? "—" : `${v.toFixed(3)}° · d ${dOf(v, wavelength).toFixed(4)} Å`),
          },
          ...SERIES.map((s) => ({ label: s.label, stroke: s.color, width: s.width, dash: s.dash, show: shown[s.key], value: (_u: uPlot, v: number | null) => (v == null ? "—" : Math.round(v).toLocaleString("en")) })),
        ],
        axes: [
          {
            label: axis === "d" ? "d (Å)" : "2θ (°)",
            labelSize: 24,
            stroke: "#5f6b6d",
            grid: { stroke: "#ece8df", width: 1 },
            ...(axis === "d"
              ? {
                  splits: (u: uPlot, _i: number, min: number, max: number) => dSplits(u, min, max, wavelength),
                  values: (_u: uPlot, splits: number[]) => splits.map((tt) => {
                    const d = dOf(tt, wavelength);
                    return d >= 10 ? d.toFixed(0) : d >= 2 ? d.toFixed(1) : d.toFixed(2);
                  }),
                }
              : {}),
          },
          { label: log ? "Counts (log)" : "Counts", labelSize: 24, stroke: "#5f6b6d", grid: { stroke: "#ece8df", width: 1 }, size: 60 },
        ],
        hooks: {
          setCursor: [(u) => setReadout(u.cursor.idx ?? null)],
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
      if (keepX && keepX.min != null && keepX.max != null) plot.setScale("x", { min: keepX.min, max: keepX.max });
      plotRef.current = plot;
      setReady(true);
    });
    return () => {
      disposed = true;
      plot?.destroy();
      if (plotRef.current === plot) plotRef.current = null;
    };
    // `shown` is applied below without rebuilding; overlays/peaks redraw through drawState.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [data, axis, log, height, wavelength]);

  // Series visibility without rebuilding.
  useEffect(() => {
    const u = plotRef.current;
    if (!u) return;
    SERIES.forEach((s, i) => u.setSeries(i + 1, { show: shown[s.key] }));
    u.redraw(false);
  }, [shown, ready]);

  // Follow the container width.
  useEffect(() => {
    const el = wrapRef.current;
    if (!el) return;
    const ro = new ResizeObserver(() => {
      const u = plotRef.current;
      if (u && el.clientWidth > 0) u.setSize({ width: Math.max(280, el.clientWidth), height });
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, [height]);

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

  const toggle = (k: SeriesKey | "peaks") => setShown((s) => ({ ...s, [k]: !s[k] }));
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
          {SERIES.map((s) => (
            <button key={s.key} type="button" className={btn} aria-pressed={shown[s.key]} onClick={() => toggle(s.key)}>
              <span aria-hidden className="mr-1 inline-block h-0.5 w-3 align-middle" style={{ background: s.color }} />
              {s.label}
            </button>
          ))}
          <button type="button" className={btn} aria-pressed={shown.peaks} onClick={() => toggle("peaks")}>
            ▼ Peaks
          </button>
        </div>
      </div>
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
      <div
        ref={wrapRef}
        tabIndex={0}
        onKeyDown={onKey}
        onDoubleClick={reset}
        role="img"
        aria-label={`Diffractogram, ${twoTheta.length} points from ${full.min.toFixed(2)} to ${full.max.toFixed(2)}° 2θ, ${peaks.length} peaks marked`}
        data-testid="diffractogram"
        className="min-h-[200px] w-full overflow-hidden rounded-md border border-line bg-white focus-visible:outline-2"
        style={{ minHeight: height + 40 }}
      />
      <p className="min-h-5 text-xs tabular-nums" aria-live="off" data-testid="readout">
        {readout != null && twoTheta[readout] != null ? (
          <>
            2θ <span className="font-medium">{twoTheta[readout].toFixed(3)}°</span> · d <span className="font-medium">{dOf(twoTheta[readout], wavelength).toFixed(4)} Å</span> · observed{" "}
            <span className="font-medium">{Math.round(raw[readout]).toLocaleString("en")}</span> · background {Math.round(background[readout]).toLocaleString("en")} · fitted {Math.round(fitted[readout]).toLocaleString("en")} counts
          </>
        ) : (
          <span className="text-muted">Point at the plot to read 2θ, d and counts.</span>
        )}
      </p>
      <p className="text-xs text-muted">Drag across the plot to zoom, use the wheel over the plot to zoom at the pointer, arrow keys or ◀ ▶ to pan, double-click or Reset to see the whole scan.</p>
    </div>
  );
}

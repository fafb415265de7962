"use client";

import { useMemo, useState } from "react";
import type { PeakRow } from "./types";

/** The fitted peaks: 2θ, d, relative intensity, height, FWHM (± fit uncertainty); unexplained peaks are marked. */
export function PeakTable({ peaks, unexplained, wavelength }: { peaks: PeakRow[]; unexplained: { twoTheta: number }[]; wavelength: number }) {
  const [sort, setSort] = useState<"twoTheta" | "intensity">("twoTheta");
  const open = useMemo(() => new Set(unexplained.map((u) => u.twoTheta.toFixed(3))), [unexplained]);
  const rows = useMemo(() => [...peaks].sort((a, b) => (sort === "twoTheta" ? a.twoTheta - b.twoTheta : b.relIntensity - a.relIntensity)), [peaks, sort]);
  if (peaks.length === 0) return <p className="text-sm text-muted">No peaks above the detection threshold.</p>;
  const th = "px-2 py-1.5 text-right font-medium";
  return (
    <div>
      <div className="mb-2 flex items-center justify-between gap-2 text-xs text-muted">
        <span>
          {peaks.length} peaks · λ = {wavelength.toFixed(5)} Å · {unexplained.length} not explained by the fit (marked ○)
        </span>
        <label className="flex items-center gap-1">
          Sort
          <select value={sort} onChange={(e) => setSort(e.target.value as typeof sort)} className="rounded border border-line bg-white px-1 py-0.5 text-xs">
            <option value="twoTheta">by 2θ</option>
            <option value="intensity">by intensity</option>
          </select>
        </label>
      </div>
      {/* A scrolling region is focusable so keyboard users can scroll it (WCAG 2.1.1); it is the diffractogram's text alternative. */}
      <div className="max-h-96 overflow-auto rounded-md border border-line" tabIndex={0} role="region" aria-label="Peak table (scrolls)">
        <table className="w-full text-sm tabular-nums" data-testid="peak-table">
          <caption className="sr-only">Fitted peaks</caption>
          <thead className="sticky top-0 bg-stone text-xs text-muted">
            <tr>
              <th className={th} scope="col">
                2θ (°)
              </th>
              <th className={th} scope="col">
                d (Å)
              </th>
              <th className={th} scope="col">
                I/I₁ (%)
              </th>
              <th className={th} scope="col">
                Height (counts)
              </th>
              <th className={th} scope="col">
                FWHM (° 2θ)
              </th>
              <th className="px-2 py-1.5" scope="col">
                <span className="sr-only">Explained</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {rows.map((p) => {
              const unexp = open.has(p.twoTheta.toFixed(3));
              return (
                <tr key={p.id} className="border-t border-line">
                  <td className="px-2 py-1 text-right">{p.twoTheta.toFixed(3)}</td>
                  <td className="px-2 py-1 text-right">{p.d.toFixed(4)}</td>
                  <td className="px-2 py-1 text-right">{p.relIntensity.toFixed(1)}</td>
                  <td className="px-2 py-1 text-right">{Math.round(p.height).toLocaleString("en")}</td>
                  <td className="px-2 py-1 text-right">
                    {p.fwhm != null ? p.fwhm.toFixed(3) : "—"}
                    {p.fwhmEsd != null && <span className="text-muted"> ± {p.fwhmEsd.toFixed(3)}</span>}
                  </td>
                  <td className="px-2 py-1 text-center text-muted" title={unexp ? "Not explained by the phases of the fit" : undefined}>
                    {unexp ? "○" : ""}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </div>
  );
}

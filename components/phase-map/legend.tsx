"use client";

import { useMemo } from "react";
import { MINERAL_CLASSES, phaseGlyphSvg, phaseSymbol, stationSymbolSvg, type PhaseMapStation } from "@/lib/phase-map";

function Svg({ svg, label }: { svg: string; label: string }) {
  return <span role="img" aria-label={label} className="inline-flex shrink-0" dangerouslySetInnerHTML={{ __html: svg }} />;
}

/** Legend of the phase map: confidence (fill vs dashed outline), rings, the minerals shown and the class colours. */
export function PhaseLegend({ stations }: { stations: readonly PhaseMapStation[] }) {
  const minerals = useMemo(() => {
    const m = new Map<string, string | null>();
    for (const s of stations) for (const p of s.phases) if (!m.has(p.mineral)) m.set(p.mineral, p.group);
    return [...m.entries()].sort((a, b) => (a[0] < b[0] ? -1 : 1)).slice(0, 40);
  }, [stations]);
  const q = phaseSymbol("quartz", "silica");
  const py = phaseSymbol("pyrite", "sulfide");
  const seg = (s: typeof q, confirmed: boolean, weight: number | null = null) => ({ symbol: s.symbol, colour: s.colour, shape: s.shape, confirmed, weight });
  return (
    <section aria-labelledby="phase-legend" className="space-y-3 text-xs">
      <h2 id="phase-legend" className="text-sm font-semibold">
        Legend
      </h2>
      <ul className="grid gap-1.5 sm:grid-cols-2">
        <li className="flex items-center gap-2">
          <Svg svg={phaseGlyphSvg(seg(py, true), { radius: 9 }).svg} label="filled symbol" /> Confirmed (accepted on a signed-off scan)
        </li>
        <li className="flex items-center gap-2">
          <Svg svg={phaseGlyphSvg(seg(py, false), { radius: 9 }).svg} label="dashed outline symbol" /> Candidate — not an identification
        </li>
        <li className="flex items-center gap-2">
          <Svg svg={stationSymbolSvg([seg(q, true, 70), seg(py, true, 20), seg(py, false)], { radius: 15 }).svg} label="ring" /> Several phases: one ring segment each (share by wt%)
        </li>
        <li className="flex items-center gap-2">
          <Svg svg={stationSymbolSvg([]).svg} label="small open circle" /> Station without a result yet
        </li>
      </ul>
      {minerals.length > 0 && (
        <div>
          <h3 className="mb-1 font-medium text-muted">Minerals on the map (IMA symbols)</h3>
          <ul className="flex flex-wrap gap-x-3 gap-y-1" data-testid="legend-minerals">
            {minerals.map(([m, g]) => {
              const s = phaseSymbol(m, g);
              return (
                <li key={m} className="flex items-center gap-1">
                  <Svg svg={phaseGlyphSvg({ symbol: s.symbol, colour: s.colour, shape: s.shape, confirmed: true }, { radius: 8, label: false }).svg} label={`${s.groupLabel} symbol`} />
                  <span>
                    <b>{s.symbol}</b> {m}
                  </span>
                </li>
              );
            })}
          </ul>
        </div>
      )}
      <div>
        <h3 className="mb-1 font-medium text-muted">Colour = mineral class (Paul Tol&apos;s colour-blind-safe muted palette); shape = group</h3>
        <ul className="flex flex-wrap gap-x-3 gap-y-1">
          {Object.entries(MINERAL_CLASSES).map(([k, c]) => (
            <li key={k} className="flex items-center gap-1">
              <span className="inline-block h-3 w-3 rounded-sm border border-ink/40" style={{ background: c.colour }} aria-hidden="true" />
              {c.label}
            </li>
          ))}
        </ul>
      </div>
    </section>
  );
}

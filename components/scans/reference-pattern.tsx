"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { referenceKeys } from "@/lib/client/query-keys";
import { useId, useState } from "react";
import { HazardCautions } from "@/components/cautions";
import { Badge } from "@/components/ui/badge";
import { Card, Skeleton } from "@/components/ui/card";
import { inputClass } from "@/components/ui/field";
import { fetchJson } from "@/lib/client/fetch-json";
import { ANODES } from "@/lib/vocabulary";

interface PhaseInfo {
  id: string;
  mineral: string;
  formula: string;
  group: string | null;
  crystalSystem: string;
  spaceGroup: string;
  cell: { a: number; b: number; c: number; alpha: number; beta: number; gamma: number };
  elements: string[];
  hazard: "asbestos" | "crystalline_silica" | null;
  otherHazards: string[];
  rir: number | null;
  builtin: boolean;
  citation: string;
  importedByName: string | null;
}

interface PatternResponse {
  pattern: { wavelength: number; anode: string | null; twoThetaMax: number; lines: { h: number; k: number; l: number; d: number; twoTheta: number; intensity: number; multiplicity: number }[]; warnings: string[]; geometry: string };
}

/** Stick pattern as SVG: one bar per line, 2θ across, I/I₁₀₀ up. */
function Sticks({ lines, max }: { lines: PatternResponse["pattern"]["lines"]; max: number }) {
  const W = 800;
  const H = 240;
  const pad = { l: 36, r: 14, t: 8, b: 40 };
  const x = (tt: number) => pad.l + ((tt - 0) / max) * (W - pad.l - pad.r);
  const y = (i: number) => H - pad.b - (i / 100) * (H - pad.t - pad.b);
  const ticks = Array.from({ length: Math.floor(max / 10) + 1 }, (_, i) => i * 10);
  return (
    <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full" role="img" aria-label={`Calculated stick pattern, ${lines.length} lines up to ${max}° 2θ`} data-testid="reference-sticks">
      <line x1={pad.l} x2={W - pad.r} y1={H - pad.b} y2={H - pad.b} stroke="#5f6b6d" />
      {ticks.map((t) => (
        <g key={t}>
          <line x1={x(t)} x2={x(t)} y1={H - pad.b} y2={H - pad.b + 4} stroke="#5f6b6d" />
          <text x={x(t)} y={H - pad.b + 17} fontSize="11" textAnchor="middle" fill="#5f6b6d">
            {t}
          </text>
        </g>
      ))}
      {[0, 50, 100].map((v) => (
        <text key={v} x={pad.l - 4} y={y(v) + 4} fontSize="11" textAnchor="end" fill="#5f6b6d">
          {v}
        </text>
      ))}
      {lines.map((l, i) => (
        <line key={i} x1={x(l.twoTheta)} x2={x(l.twoTheta)} y1={y(0)} y2={y(l.intensity)} stroke="#1d5c63" strokeWidth={2}>
          <title>{`${l.h} ${l.k} ${l.l}: d ${l.d.toFixed(4)} Å, 2θ ${l.twoTheta.toFixed(3)}°, I ${l.intensity.toFixed(1)}`}</title>
        </line>
      ))}
      <text x={(W + pad.l) / 2} y={H - 4} fontSize="12" textAnchor="middle" fill="#5f6b6d">
        2θ (°)
      </text>
    </svg>
  );
}

/** A reference phase: cell, citation, RIR, hazards, and its calculated pattern for any anode or wavelength. */
export function ReferencePatternView({ phase }: { phase: PhaseInfo }) {
  const id = useId();
  const [anode, setAnode] = useState("Cu");
  const [custom, setCustom] = useState("");
  const wl = anode === "custom" ? Number(custom.replace(",", ".")) : NaN;
  const valid = anode !== "custom" || (wl > 0.1 && wl < 5);
  const query = anode === "custom" ? `wavelength=${wl}` : `anode=${anode}`;
  const { data, isFetching, error } = useQuery({
    queryKey: referenceKeys.view(phase.id, query),
    queryFn: () => fetchJson<PatternResponse>(`/api/reference-phases/${phase.id}?${query}&twoThetaMax=100`),
    enabled: valid,
    placeholderData: keepPreviousData,
  });
  const lines = data?.pattern.lines ?? [];
  const c = phase.cell;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold capitalize">{phase.mineral}</h1>
        <span className="text-muted">{phase.formula}</span>
        {!phase.builtin && <Badge tone="brand">Imported{phase.importedByName ? ` by ${phase.importedByName}` : ""}</Badge>}
        <a href={`/api/reference-phases/${phase.id}/cif`} className="text-sm font-medium text-brand hover:underline">
          Download CIF
        </a>
      </div>
      <HazardCautions phases={[{ mineral: phase.mineral, hazard: phase.hazard, otherHazards: phase.otherHazards }]} />
      <div className="grid gap-4 lg:grid-cols-3">
        <Card>
          <h2 className="mb-2 font-semibold">Structure</h2>
          <dl className="space-y-1 text-sm">
            <div>
              <dt className="inline text-muted">System, space group: </dt>
              <dd className="inline">
                {phase.crystalSystem}, {phase.spaceGroup}
              </dd>
            </div>
            <div>
              <dt className="inline text-muted">Cell: </dt>
              <dd className="inline tabular-nums">
                a {c.a} Å, b {c.b} Å, c {c.c} Å, α {c.alpha}°, β {c.beta}°, γ {c.gamma}°
              </dd>
            </div>
            {phase.group && (
              <div>
                <dt className="inline text-muted">Group: </dt>
                <dd className="inline">{phase.group}</dd>
              </div>
            )}
            <div>
              <dt className="inline text-muted">Elements: </dt>
              <dd className="inline">{phase.elements.join(", ")}</dd>
            </div>
            <div>
              <dt className="inline text-muted">RIR (I/I corundum, calculated): </dt>
              <dd className="inline tabular-nums">{phase.rir ?? "—"}</dd>
            </div>
            <div>
              <dt className="inline text-muted">Structure reference: </dt>
              <dd className="inline">{phase.citation}</dd>
            </div>
          </dl>
        </Card>
        <Card className="lg:col-span-2">
          <div className="mb-2 flex flex-wrap items-end gap-3">
            <h2 className="mr-auto font-semibold">Calculated pattern</h2>
            <div>
              <label htmlFor={`${id}-anode`} className="block text-xs font-medium">
                Anode
              </label>
              <select id={`${id}-anode`} className={inputClass} value={anode} onChange={(e) => setAnode(e.target.value)}>
                {ANODES.map((a) => (
                  <option key={a} value={a}>
                    {a} Kα1
                  </option>
                ))}
                <option value="custom">Other wavelength…</option>
              </select>
            </div>
            {anode === "custom" && (
              <div>
                <label htmlFor={`${id}-wl`} className="block text-xs font-medium">
                  λ (Å)
                </label>
                <input id={`${id}-wl`} className={`${inputClass} w-28`} inputMode="decimal" value={custom} onChange={(e) => setCustom(e.target.value)} aria-invalid={!valid} />
              </div>
            )}
          </div>
          {!valid && <p className="text-xs text-danger">Type a wavelength between 0.1 and 5 Å.</p>}
          {error && <p role="alert" className="text-sm text-danger">{(error as Error).message}</p>}
          {data ? <Sticks lines={lines} max={100} /> : <Skeleton className="h-48 w-full" />}
          {data && (
            <p className="mt-1 text-xs text-muted">
              λ = {data.pattern.wavelength} Å · {data.pattern.geometry} · lines with I ≥ 0.5 up to 100° 2θ{isFetching ? " · updating…" : ""}
              {data.pattern.warnings.length > 0 && ` · ${data.pattern.warnings.join(" ")}`}
            </p>
          )}
        </Card>
      </div>
      {data && (
        <Card>
          <h2 className="mb-2 font-semibold">Lines ({lines.length})</h2>
          <div className="max-h-96 overflow-auto">
            <table className="w-full text-sm tabular-nums">
              <caption className="sr-only">Calculated lines</caption>
              <thead className="sticky top-0 bg-stone text-xs text-muted">
                <tr>
                  <th scope="col" className="px-2 py-1 text-left font-medium">
                    h k l
                  </th>
                  <th scope="col" className="px-2 py-1 text-right font-medium">
                    d (Å)
                  </th>
                  <th scope="col" className="px-2 py-1 text-right font-medium">
                    2θ (°)
                  </th>
                  <th scope="col" className="px-2 py-1 text-right font-medium">
                    I/I₁₀₀
                  </th>
                  <th scope="col" className="px-2 py-1 text-right font-medium">
                    m
                  </th>
                </tr>
              </thead>
              <tbody>
                {lines.map((l, i) => (
                  <tr key={i} className="border-t border-line">
                    <td className="px-2 py-0.5">
                      {l.h} {l.k} {l.l}
                    </td>
                    <td className="px-2 py-0.5 text-right">{l.d.toFixed(4)}</td>
                    <td className="px-2 py-0.5 text-right">{l.twoTheta.toFixed(3)}</td>
                    <td className="px-2 py-0.5 text-right">{l.intensity.toFixed(1)}</td>
                    <td className="px-2 py-0.5 text-right">{l.multiplicity}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </Card>
      )}
    </div>
  );
}

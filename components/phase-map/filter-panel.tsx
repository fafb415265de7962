"use client";

import { usePathname, useRouter } from "next/navigation";
import { useMemo } from "react";
import { buttonClass } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { groupStyle, type MineralOption } from "@/lib/phase-map";
import { cn } from "@/lib/utils";

const KEYS = ["mineral", "group", "phase", "leading", "lithology", "collector", "from", "to"] as const;

/** Phase-map filters, kept in the URL so links, exports and share links carry them. */
export function PhaseFilterPanel({ params, minerals }: { params: Record<string, string>; minerals: MineralOption[] }) {
  const router = useRouter();
  const pathname = usePathname();
  const groups = useMemo(() => [...new Set(minerals.map((m) => m.group).filter((g): g is string => !!g))].sort(), [minerals]);
  const phase = params.phase ?? "confirmed";

  function apply(update: Record<string, string | null>) {
    const next = new URLSearchParams(params);
    for (const [k, v] of Object.entries(update)) {
      if (v === null || v === "") next.delete(k);
      else next.set(k, v);
    }
    if (next.get("phase") === "confirmed") next.delete("phase");
    router.replace(`${pathname}${next.size ? `?${next.toString()}` : ""}`, { scroll: false });
  }
  const active = KEYS.filter((k) => params[k]).length;

  return (
    <form
      aria-label="Filter the phase map"
      key={JSON.stringify(params)}
      className="grid grid-cols-2 gap-2 md:grid-cols-4 xl:grid-cols-8"
      onSubmit={(e) => {
        e.preventDefault();
        const f = new FormData(e.currentTarget);
        apply(Object.fromEntries(KEYS.map((k) => [k, String(f.get(k) ?? "")])));
      }}
    >
      <label className="col-span-2 text-xs text-muted">
        Mineral
        <select name="mineral" value={params.mineral ?? ""} className={cn(inputClass, "mt-0.5")} data-testid="filter-mineral" onChange={(e) => apply({ mineral: e.target.value })}>
          <option value="">Any mineral</option>
          {minerals.map((m) => (
            <option key={m.mineral} value={m.mineral}>
              {m.symbol} — {m.mineral} ({m.confirmedStations} confirmed{m.candidateStations ? `, ${m.candidateStations} candidate only` : ""})
            </option>
          ))}
        </select>
      </label>
      <label className="text-xs text-muted">
        Group
        <select name="group" value={params.group ?? ""} className={cn(inputClass, "mt-0.5")} onChange={(e) => apply({ group: e.target.value })}>
          <option value="">Any group</option>
          {groups.map((g) => (
            <option key={g} value={g}>
              {groupStyle(g).label}
            </option>
          ))}
        </select>
      </label>
      <fieldset className="col-span-2 text-xs text-muted">
        <legend>Results shown</legend>
        <div className="mt-1 flex flex-wrap gap-x-3 gap-y-1 text-sm text-ink" role="radiogroup">
          {[
            ["confirmed", "Confirmed only"],
            ["any", "With candidates"],
            ["candidate", "Candidates only"],
          ].map(([v, label]) => (
            <label key={v} className="flex items-center gap-1">
              <input type="radio" name="phase" value={v} defaultChecked={phase === v} onChange={() => apply({ phase: v })} data-testid={`phase-${v}`} />
              {label}
            </label>
          ))}
        </div>
      </fieldset>
      <label className="text-xs text-muted">
        Leading candidates
        <select name="leading" value={params.leading ?? "3"} className={cn(inputClass, "mt-0.5")} disabled={phase === "confirmed"} onChange={(e) => apply({ leading: e.target.value === "3" ? null : e.target.value })}>
          {[1, 2, 3, 5, 10].map((n) => (
            <option key={n} value={n}>
              Top {n}
            </option>
          ))}
        </select>
      </label>
      <label className="text-xs text-muted">
        Lithology
        <input name="lithology" defaultValue={params.lithology ?? ""} className={cn(inputClass, "mt-0.5")} placeholder="e.g. gossan" />
      </label>
      <label className="text-xs text-muted">
        Collector
        <input name="collector" defaultValue={params.collector ?? ""} className={cn(inputClass, "mt-0.5")} />
      </label>
      <label className="text-xs text-muted">
        Collected from
        <input name="from" type="date" defaultValue={params.from ?? ""} className={cn(inputClass, "mt-0.5")} />
      </label>
      <label className="text-xs text-muted">
        Collected to
        <input name="to" type="date" defaultValue={params.to ?? ""} className={cn(inputClass, "mt-0.5")} />
      </label>
      <div className="col-span-2 flex items-end gap-2 md:col-span-4 xl:col-span-2">
        <button type="submit" className={buttonClass("primary")}>
          Apply
        </button>
        {active > 0 && (
          <button type="button" className={buttonClass("secondary")} onClick={() => apply(Object.fromEntries(KEYS.map((k) => [k, null])))}>
            Clear ({active})
          </button>
        )}
      </div>
    </form>
  );
}

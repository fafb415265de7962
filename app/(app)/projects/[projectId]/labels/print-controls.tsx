"use client";

import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { buttonClass } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";

/** Screen-only toolbar of the label sheet: layout, labels to skip on a used sheet, print. */
export function PrintControls({ count, layouts }: { count: number; layouts: { id: string; label: string }[] }) {
  const router = useRouter();
  const pathname = usePathname();
  const search = useSearchParams();
  const set = (k: string, v: string) => {
    const next = new URLSearchParams(search.toString());
    if (v) next.set(k, v);
    else next.delete(k);
    router.replace(`${pathname}?${next.toString()}`, { scroll: false });
  };
  return (
    <div className="no-print flex flex-wrap items-end gap-3">
      <label className="text-sm">
        <span className="mb-1 block font-medium">Sheet</span>
        <select className={inputClass} value={search.get("layout") ?? layouts[0].id} onChange={(e) => set("layout", e.target.value)}>
          {layouts.map((l) => (
            <option key={l.id} value={l.id}>
              {l.label}
            </option>
          ))}
        </select>
      </label>
      <label className="text-sm">
        <span className="mb-1 block font-medium">Skip labels already used</span>
        <input className={inputClass} type="number" min={0} max={23} value={search.get("skip") ?? "0"} onChange={(e) => set("skip", e.target.value === "0" ? "" : e.target.value)} />
      </label>
      <button type="button" className={buttonClass("primary")} onClick={() => window.print()} disabled={count === 0}>
        Print {count} label{count === 1 ? "" : "s"}
      </button>
      <p className="basis-full text-xs text-muted">Print at 100 % (no “fit to page”), A4 portrait, no margins. Check one sheet on plain paper first.</p>
    </div>
  );
}

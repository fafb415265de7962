"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { useEffect, useState } from "react";
import { cn } from "@/lib/utils";

/**
 * The field geologist's destinations at the bottom of a phone screen (hidden from md up, where the tabs fit):
 * map, stations, new sample (quick capture) and sync with the number of records and photos not yet sent.
 */
export function BottomNav({ projectId, canWrite }: { projectId: string; canWrite: boolean }) {
  const path = usePathname();
  const [pending, setPending] = useState(0);
  // The outbox (Dexie) loads after the first paint: the count is a hint, not part of the page.
  useEffect(() => {
    let live = true;
    let stop: (() => void) | undefined;
    let stopPhotos: (() => void) | undefined;
    let records = 0;
    let photos = 0;
    void Promise.all([import("@/lib/client/outbox"), import("@/lib/client/photo-queue")]).then(([{ watchOutbox }, { watchPhotoQueue }]) => {
      if (!live) return;
      stop = watchOutbox(projectId, ({ items }) => setPending((records = items.length) + photos));
      stopPhotos = watchPhotoQueue(projectId, (items) => setPending(records + (photos = items.length)));
    });
    return () => {
      live = false;
      stop?.();
      stopPhotos?.();
    };
  }, [projectId]);
  const base = `/projects/${projectId}`;
  const items = canWrite
    ? [
        { href: `${base}/map`, label: "Map", icon: "M3 6l6-3 6 3 6-3v15l-6 3-6-3-6 3z M9 3v15 M15 6v15" },
        { href: `${base}/stations`, label: "Stations", icon: "M12 21s-7-6.2-7-11a7 7 0 0114 0c0 4.8-7 11-7 11z M12 12.5a2.5 2.5 0 100-5 2.5 2.5 0 000 5z" },
        { href: `${base}/samples/quick`, label: "New sample", icon: "M12 5v14 M5 12h14" },
        { href: `${base}/sync`, label: "Sync", icon: "M4 12a8 8 0 0113.7-5.7L20 8.6 M20 4v4.6h-4.6 M20 12a8 8 0 01-13.7 5.7L4 15.4 M4 20v-4.6h4.6" },
      ]
    : [
        { href: `${base}/map`, label: "Map", icon: "M3 6l6-3 6 3 6-3v15l-6 3-6-3-6 3z M9 3v15 M15 6v15" },
        { href: `${base}/samples`, label: "Samples", icon: "M5 4h14v16H5z M8 8h8 M8 12h8 M8 16h5" },
        { href: `${base}/stations`, label: "Stations", icon: "M12 21s-7-6.2-7-11a7 7 0 0114 0c0 4.8-7 11-7 11z M12 12.5a2.5 2.5 0 100-5 2.5 2.5 0 000 5z" },
      ];
  return (
    <nav aria-label="Field" className="no-print fixed inset-x-0 bottom-0 z-[1100] border-t border-line bg-white pb-[env(safe-area-inset-bottom)] md:hidden" data-testid="bottom-nav">
      <ul className="flex">
        {items.map((item) => {
          const active = path === item.href || path.startsWith(`${item.href}/`);
          return (
            <li key={item.href} className="flex-1">
              <Link
                href={item.href}
                aria-current={active ? "page" : undefined}
                className={cn("relative flex min-h-14 flex-col items-center justify-center gap-0.5 px-1 py-1.5 text-xs font-medium", active ? "text-brand-dark" : "text-muted")}
              >
                <svg viewBox="0 0 24 24" className="h-6 w-6" fill="none" stroke="currentColor" strokeWidth={1.8} strokeLinecap="round" strokeLinejoin="round" aria-hidden="true">
                  <path d={item.icon} />
                </svg>
                {item.label}
                {item.label === "Sync" && pending > 0 && (
                  <span className="absolute right-[22%] top-1 min-w-5 rounded-full bg-oxide px-1 text-center text-[11px] leading-5 text-white" aria-label={`${pending} not yet synced`}>
                    {pending}
                  </span>
                )}
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}

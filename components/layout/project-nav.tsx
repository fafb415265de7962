"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { cn } from "@/lib/utils";

export interface NavItem {
  href: string;
  label: string;
}

/** Tabs of a project; the current section is marked for screen readers too. */
export function ProjectNav({ items }: { items: NavItem[] }) {
  const path = usePathname();
  return (
    <nav aria-label="Project sections" className="no-print border-b border-line bg-white">
      <ul className="mx-auto flex max-w-7xl gap-1 overflow-x-auto px-4">
        {items.map((item, i) => {
          const active = i === 0 ? path === item.href : path === item.href || path.startsWith(`${item.href}/`);
          return (
            <li key={item.href}>
              <Link
                href={item.href}
                aria-current={active ? "page" : undefined}
                className={cn("block whitespace-nowrap border-b-2 px-3 py-2.5 text-sm font-medium", active ? "border-oxide text-ink" : "border-transparent text-muted hover:text-ink")}
              >
                {item.label}
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}

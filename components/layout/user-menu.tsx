"use client";

import { useRouter } from "next/navigation";
import { useEffect, useRef, useState } from "react";
import { clearPrivateCaches } from "@/lib/client/offline-cache";

/** Name, e-mail and the role in the current project; sign-out. */
export function UserMenu({ name, email, roleLabel, isAdmin }: { name: string; email: string; roleLabel?: string; isAdmin?: boolean }) {
  const [open, setOpen] = useState(false);
  const router = useRouter();
  const ref = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const close = (e: MouseEvent) => ref.current && !ref.current.contains(e.target as Node) && setOpen(false);
    document.addEventListener("click", close);
    return () => document.removeEventListener("click", close);
  }, []);
  const initials = name
    .split(/\s+/)
    .map((p) => p[0])
    .slice(0, 2)
    .join("")
    .toUpperCase();
  return (
    <div className="relative" ref={ref}>
      <button
        type="button"
        onClick={() => setOpen((o) => !o)}
        aria-expanded={open}
        aria-haspopup="menu"
        className="flex items-center gap-2 rounded-full border border-line bg-white py-1 pl-1 pr-3 text-sm hover:bg-stone"
        data-testid="user-menu"
      >
        <span className="flex h-7 w-7 items-center justify-center rounded-full bg-brand text-xs font-semibold text-white">{initials}</span>
        <span className="hidden text-left sm:block">
          <span className="block font-medium leading-tight">{name}</span>
          {roleLabel && <span className="block text-xs leading-tight text-muted" data-testid="user-role">{roleLabel}</span>}
        </span>
      </button>
      {open && (
        <div role="menu" className="absolute right-0 z-[1100] mt-2 w-60 rounded-md border border-line bg-white p-2 shadow-lg">
          <p className="px-2 py-1 text-sm font-medium">{name}</p>
          <p className="px-2 pb-1 text-xs text-muted">{email}</p>
          {roleLabel && <p className="px-2 pb-2 text-xs text-muted sm:hidden">{roleLabel}</p>}
          {isAdmin && (
            <a role="menuitem" href="/admin/users" className="block w-full rounded px-2 py-1.5 text-left text-sm hover:bg-stone">
              Accounts (site admin)
            </a>
          )}
          <button
            role="menuitem"
            className="w-full rounded px-2 py-1.5 text-left text-sm hover:bg-stone"
            onClick={async () => {
              // The auth client (about 12 kB gzip) loads on sign-out only, not with every page.
              const { authClient } = await import("@/lib/auth-client");
              await authClient.signOut();
              await clearPrivateCaches();
              router.push("/sign-in");
              router.refresh();
            }}
          >
            Sign out
          </button>
        </div>
      )}
    </div>
  );
}

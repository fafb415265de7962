import Link from "next/link";
import { Logo } from "@/components/ui/logo";
import type { Actor } from "@/lib/dal/actor";
import { UserMenu } from "./user-menu";

export function AppHeader({ actor, roleLabel, children }: { actor: Actor; roleLabel?: string; children?: React.ReactNode }) {
  return (
    <header className="no-print border-b border-line bg-white">
      <div className="mx-auto flex max-w-7xl items-center justify-between gap-3 px-4 py-2.5">
        <div className="flex min-w-0 items-center gap-4">
          <Link href="/projects" aria-label="Lithodex — all projects">
            <Logo />
          </Link>
          {children}
        </div>
        <UserMenu name={actor.name} email={actor.email} roleLabel={roleLabel ?? (actor.isAdmin ? "Site admin" : undefined)} isAdmin={actor.isAdmin} />
      </div>
    </header>
  );
}

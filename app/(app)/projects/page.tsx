import type { Metadata } from "next";
import Link from "next/link";
import { AppHeader } from "@/components/layout/app-header";
import { Badge } from "@/components/ui/badge";
import { buttonClass } from "@/components/ui/button";
import { canCreateProjects, listProjects } from "@/lib/dal/projects";
import { ROLE_LABELS } from "@/lib/dal/permissions";
import { currentActor } from "@/lib/dal/session";

export const metadata: Metadata = { title: "Projects" };

export default async function ProjectsPage() {
  const actor = await currentActor();
  const all = await listProjects(actor);
  const projects = all.filter((p) => !p.archivedAt);
  const archived = all.filter((p) => p.archivedAt);
  return (
    <>
      <AppHeader actor={actor} />
      <main className="mx-auto max-w-5xl px-4 py-8">
        <div className="mb-6 flex flex-wrap items-center justify-between gap-3">
          <h1 className="text-2xl font-semibold">Projects</h1>
          {canCreateProjects(actor) && (
            <Link href="/projects/new" className={buttonClass("primary")}>
              New project
            </Link>
          )}
        </div>
        {projects.length === 0 ? (
          <p className="rounded-md border border-line bg-white p-6 text-muted">You are not a member of any project yet. Ask a project lead to invite you.</p>
        ) : (
          <ul className="grid gap-4 sm:grid-cols-2">
            {projects.map((p) => (
              <li key={p.id}>
                <Link href={`/projects/${p.id}`} className="block rounded-lg border border-line bg-white p-5 shadow-sm transition hover:border-brand">
                  <div className="flex items-start justify-between gap-2">
                    <h2 className="text-lg font-semibold text-brand-dark">{p.name}</h2>
                    <Badge tone="brand">{p.code}</Badge>
                  </div>
                  {p.region && <p className="mt-1 text-sm text-muted">{p.region}</p>}
                  <p className="mt-3 flex items-center justify-between text-sm">
                    <span>{p.sampleCount} samples</span>
                    <span className="text-muted">{ROLE_LABELS[p.role]}</span>
                  </p>
                </Link>
              </li>
            ))}
          </ul>
        )}
        {archived.length > 0 && (
          <section className="mt-8">
            <h2 className="mb-2 text-sm font-semibold uppercase tracking-wide text-muted">Archived (read-only)</h2>
            <ul className="grid gap-2 sm:grid-cols-2">
              {archived.map((p) => (
                <li key={p.id}>
                  <Link href={`/projects/${p.id}`} className="block rounded-md border border-line bg-stone px-4 py-2 text-sm hover:border-brand">
                    <span className="font-medium">{p.name}</span> <span className="text-muted">· {p.code} · {p.sampleCount} samples</span>
                  </Link>
                </li>
              ))}
            </ul>
          </section>
        )}
      </main>
    </>
  );
}

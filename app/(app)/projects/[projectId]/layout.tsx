import type { Metadata } from "next";
import { AppHeader } from "@/components/layout/app-header";
import { BottomNav } from "@/components/layout/bottom-nav";
import { ProjectNav } from "@/components/layout/project-nav";
import { projectSections } from "@/components/layout/project-sections";
import { OutboxAutoSync, OutboxBadge } from "@/components/layout/outbox-lazy";
import { ROLE_LABELS, roleAllows } from "@/lib/dal/permissions";
import { getProject } from "@/lib/dal/projects";
import { currentActor, orNotFound } from "@/lib/dal/session";

/** Tab titles name the project: "Arroyo Pinar… · Lithodex" on the overview, "Scans · APR · Lithodex" below it. */
export async function generateMetadata({ params }: { params: Promise<{ projectId: string }> }): Promise<Metadata> {
  const { projectId } = await params;
  const project = await getProject(await currentActor(), projectId).catch(() => null);
  return project ? { title: { default: project.name, template: `%s · ${project.code} · Lithodex` } } : {};
}

export default async function ProjectLayout({ children, params }: { children: React.ReactNode; params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await currentActor();
  const project = await orNotFound(getProject(actor, projectId));
  const items = projectSections(projectId, project.role);
  return (
    <>
      <AppHeader actor={actor} roleLabel={ROLE_LABELS[project.role]}>
        <span className="hidden truncate text-sm text-muted md:block">
          <span className="font-medium text-ink">{project.name}</span> · {project.code}
        </span>
        <OutboxBadge projectId={projectId} />
      </AppHeader>
      <OutboxAutoSync projectId={projectId} userId={actor.userId} canReserve={roleAllows(project.role, "sample.write") && !project.archivedAt} />
      <ProjectNav items={items} />
      {project.archivedAt && (
        <p role="status" className="no-print border-b border-line bg-stone px-4 py-2 text-center text-sm" data-testid="archived-banner">
          This project is archived and read-only{roleAllows(project.role, "project.manage") ? ": a lead can bring it back in Settings." : "."}
        </p>
      )}
      <main id="main" className="mx-auto max-w-7xl px-4 pb-24 pt-6 md:py-6">
        {children}
      </main>
      <BottomNav projectId={projectId} canWrite={roleAllows(project.role, "sample.write")} />
    </>
  );
}

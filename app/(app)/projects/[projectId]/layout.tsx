import { notFound } from "next/navigation";
import { AppHeader } from "@/components/layout/app-header";
import { ProjectNav } from "@/components/layout/project-nav";
import { projectSections } from "@/components/layout/project-sections";
import { AppError } from "@/lib/dal/errors";
import { ROLE_LABELS } from "@/lib/dal/permissions";
import { getProject } from "@/lib/dal/projects";
import { currentActor } from "@/lib/dal/session";

export default async function ProjectLayout({ children, params }: { children: React.ReactNode; params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await currentActor();
  const project = await getProject(actor, projectId).catch((err) => {
    if (err instanceof AppError && (err.code === "not_found" || err.code === "forbidden")) notFound();
    throw err;
  });
  const items = projectSections(projectId, project.role);
  return (
    <>
      <AppHeader actor={actor} roleLabel={ROLE_LABELS[project.role]}>
        <span className="hidden truncate text-sm text-muted md:block">
          <span className="font-medium text-ink">{project.name}</span> · {project.code}
        </span>
      </AppHeader>
      <ProjectNav items={items} />
      <div className="mx-auto max-w-7xl px-4 py-6">{children}</div>
    </>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { AppHeader } from "@/components/layout/app-header";
import { ProjectForm } from "@/components/projects/project-form";
import { canCreateProjects } from "@/lib/dal/projects";
import { currentActor } from "@/lib/dal/session";

export const metadata: Metadata = { title: "New project" };

export default async function NewProjectPage() {
  const actor = await currentActor();
  if (!canCreateProjects(actor)) notFound();
  return (
    <>
      <AppHeader actor={actor} />
      <main className="mx-auto max-w-3xl space-y-4 px-4 py-8">
        <nav className="text-sm text-muted">
          <Link href="/projects" className="hover:underline">
            Projects
          </Link>{" "}
          / New
        </nav>
        <h1 className="text-2xl font-semibold">New project</h1>
        <p className="text-sm text-muted">You become the project&apos;s lead and can invite the team afterwards.</p>
        <div className="rounded-lg border border-line bg-white p-4 shadow-sm">
          <ProjectForm />
        </div>
      </main>
    </>
  );
}

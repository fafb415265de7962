import type { Metadata } from "next";
import Link from "next/link";
import { ImportWizard } from "@/components/samples/import-wizard";
import { getProject } from "@/lib/dal/projects";
import { roleAllows } from "@/lib/dal/permissions";
import { currentActor } from "@/lib/dal/session";

export const metadata: Metadata = { title: "Import samples" };

export default async function ImportSamplesPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { role } = await getProject(await currentActor(), projectId);
  return (
    <div className="space-y-4">
      <nav className="text-sm text-muted">
        <Link href={`/projects/${projectId}/samples`} className="hover:underline">
          Sample register
        </Link>{" "}
        / Import
      </nav>
      <h1 className="text-2xl font-semibold">Import samples from CSV</h1>
      {roleAllows(role, "sample.write") ? (
        <ImportWizard projectId={projectId} />
      ) : (
        <p role="alert" className="rounded-md bg-oxide-light px-3 py-2 text-sm">
          Your role in this project cannot import samples. Ask the project lead.
        </p>
      )}
    </div>
  );
}

"use client";

import Link from "next/link";
import { useParams } from "next/navigation";

/** A record of this project that does not exist (or was deleted); the project's navigation stays above. */
export default function ProjectRecordNotFound() {
  const { projectId } = useParams<{ projectId: string }>();
  return (
    <div className="mx-auto max-w-xl py-10">
      <p className="text-sm font-semibold tracking-wide text-brand">404</p>
      <h1 className="mt-2 text-2xl font-semibold text-ink">Record not found</h1>
      <p className="mt-3 text-sm text-muted">This sample, station, scan or submission does not exist in this project, or it was removed.</p>
      <p className="mt-6">
        <Link href={projectId ? `/projects/${projectId}` : "/projects"} className="text-brand underline underline-offset-2">
          Back to the project
        </Link>
      </p>
    </div>
  );
}

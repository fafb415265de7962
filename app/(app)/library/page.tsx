import type { Metadata } from "next";
import { ReferenceLibrary } from "@/components/scans/reference-library";
import { canImportReferences } from "@/lib/dal/reference-phases";
import { currentActor } from "@/lib/dal/session";

export const metadata: Metadata = { title: "Reference library" };

export default async function LibraryPage() {
  const actor = await currentActor();
  const canImport = await canImportReferences(actor);
  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-2xl font-semibold">Reference library</h1>
        <p className="mt-1 max-w-3xl text-sm text-muted">
          Calculated powder patterns of the shipped minerals and of structures imported by the lab (Bragg–Brentano geometry, no monochromator, random orientation), with the reference
          intensity ratio used for semi-quantitative weight fractions. Calculated patterns are references for search–match, not measured data.
        </p>
      </div>
      <ReferenceLibrary canImport={canImport} />
    </div>
  );
}

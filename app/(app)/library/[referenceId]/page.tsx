import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ReferencePatternView } from "@/components/scans/reference-pattern";
import { AppError } from "@/lib/dal/errors";
import { getReferencePhaseOrThrow } from "@/lib/dal/reference-phases";
import { currentActor } from "@/lib/dal/session";

export const metadata: Metadata = { title: "Reference phase" };

export default async function ReferencePhasePage({ params }: { params: Promise<{ referenceId: string }> }) {
  const { referenceId } = await params;
  const actor = await currentActor();
  const { phase } = await getReferencePhaseOrThrow(actor, referenceId, {}).catch((err) => {
    if (err instanceof AppError && err.code === "not_found") notFound();
    throw err;
  });
  return (
    <div className="space-y-4">
      <nav className="text-sm text-muted">
        <Link href="/library" className="hover:underline">
          Reference library
        </Link>{" "}
        / <span className="capitalize">{phase.mineral}</span>
      </nav>
      <ReferencePatternView
        phase={{
          id: phase.id,
          mineral: phase.mineral,
          formula: phase.formula,
          group: phase.mineralGroup,
          crystalSystem: phase.crystalSystem,
          spaceGroup: phase.spaceGroup,
          cell: { a: phase.cellA, b: phase.cellB, c: phase.cellC, alpha: phase.cellAlpha, beta: phase.cellBeta, gamma: phase.cellGamma },
          elements: phase.elements,
          hazard: phase.hazard,
          otherHazards: phase.otherHazards,
          rir: phase.rir,
          builtin: phase.builtin,
          citation: phase.citation,
          importedByName: phase.importedByName,
        }}
      />
    </div>
  );
}

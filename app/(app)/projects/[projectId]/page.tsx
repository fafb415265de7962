import Link from "next/link";
import { Card } from "@/components/ui/card";
import { SAMPLE_STATUSES } from "@/lib/vocabulary";
import { SAMPLE_STATUS_LABELS } from "@/lib/format";
import { ROLE_LABELS } from "@/lib/dal/permissions";
import { getProjectOverview } from "@/lib/dal/projects";
import { currentActor, orNotFound } from "@/lib/dal/session";

export default async function ProjectOverviewPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await currentActor();
  const { project, counts, byStatus, members } = await orNotFound(getProjectOverview(actor, projectId));
  const tiles = [
    { label: "Stations", value: counts.stations, href: `/projects/${projectId}/stations` },
    { label: "Samples", value: counts.samples, href: `/projects/${projectId}/samples` },
    { label: "Lab submissions", value: counts.submissions, href: `/projects/${projectId}/submissions` },
    { label: "Scans", value: counts.scans, href: `/projects/${projectId}/scans` },
    // Which phases were confirmed in which outcrop: the phase map.
    { label: "Samples with confirmed phases", value: counts.samplesWithConfirmedPhases, href: `/projects/${projectId}/phase-map` },
  ];
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-semibold">{project.name}</h1>
        <p className="text-sm text-muted">
          {project.code} · {project.region}
        </p>
        {project.description && <p className="mt-2 max-w-3xl text-sm">{project.description}</p>}
      </div>
      <ul className="grid grid-cols-2 gap-3 md:grid-cols-5" aria-label="Project counts">
        {tiles.map((t) => (
          <li key={t.label}>
            <Card className="h-full">
              <p className="text-xs uppercase tracking-wide text-muted">{t.label}</p>
              <p className="mt-1 text-2xl font-semibold" data-testid={`count-${t.label.toLowerCase().replace(/\s+/g, "-")}`}>
                {t.href ? (
                  <Link href={t.href} className="text-brand hover:underline">
                    {t.value}
                  </Link>
                ) : (
                  t.value
                )}
              </p>
            </Card>
          </li>
        ))}
      </ul>
      <div className="grid gap-4 md:grid-cols-2">
        <Card>
          <h2 className="mb-3 font-semibold">Samples by status</h2>
          <table className="w-full text-sm">
            <tbody>
              {SAMPLE_STATUSES.filter((s) => byStatus[s]).map((s) => (
                <tr key={s} className="border-t border-line first:border-0">
                  <td className="py-1.5">
                    <Link href={`/projects/${projectId}/samples?status=${s}`} className="text-brand hover:underline">
                      {SAMPLE_STATUS_LABELS[s]}
                    </Link>
                  </td>
                  <td className="py-1.5 text-right tabular-nums">{byStatus[s]}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Card>
        <Card>
          <h2 className="mb-3 font-semibold">Team</h2>
          <ul className="space-y-1.5 text-sm">
            {members.map((m) => (
              <li key={m.email} className="flex justify-between gap-2">
                <span>{m.name}</span>
                <span className="text-muted">{ROLE_LABELS[m.role]}</span>
              </li>
            ))}
          </ul>
        </Card>
      </div>
      <p className="text-xs text-muted">
        Field safety: work in pairs or to a check-in schedule, share traverse plans and carry communication; Lithodex is not an emergency system. Follow your site
        procedures and local regulations.
      </p>
    </div>
  );
}
